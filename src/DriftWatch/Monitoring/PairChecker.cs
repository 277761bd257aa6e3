using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Hosting;
using DriftWatch.Sources;
using DriftWatch.Spool;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;
using Serilog.Context;

namespace DriftWatch.Monitoring;

/// <summary>
/// One check of one pair: sample → profile → baseline → findings → one store transaction.
/// The scheduler and the <c>check</c> command both come through here. A failure of the pair is recorded
/// as a failed run and returned, never thrown: one broken pair never stops the others. A window with nothing
/// to measure (see <see cref="Measurability"/>) is recorded as an unmeasurable run, with the reason as its error.
/// </summary>
internal sealed class PairChecker(
    DriftWatchConfig config,
    ISourceFactory sources,
    IHistoryStore store,
    BaselineService baselines,
    TimeProvider time,
    RunRecorder recorder,
    ILogger<PairChecker> logger,
    LiveConfig? live = null)
{
    public Task<PairCheckResult> CheckAsync(PairConfig pair, CancellationToken cancellationToken) => CheckAsync(pair, null, cancellationToken);

    /// <param name="slot">The schedule slot this check is for (recorded with the run); null for checks not started by the schedule.</param>
    public async Task<PairCheckResult> CheckAsync(PairConfig pair, DateTimeOffset? slot, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        using var _ = LogContext.PushProperty("Pair", pair.Name);
        var startedAt = time.GetUtcNow();
        // A marker on the local disk until the run is recorded: a crash in between becomes an interrupted run.
        var runKey = recorder.Begin(pair.Name, startedAt);
        RelationshipProfile? profile = null;
        IReadOnlyList<Finding> findings = [];
        SampledPair? sampled = null;
        StoredBaseline? baseline = null;
        string? error = null;
        string? unmeasurable = null;
        var hasStoredBaseline = false;
        try
        {
            var source = (live?.Current ?? config).FindSource(pair.Source)
                ?? throw new SourceException(SourceFailure.QueryError, $"pair '{pair.Name}': source '{pair.Source}' is not configured");
            var adapter = sources.Create(source);
            sampled = await adapter.SampleAsync(pair, startedAt, cancellationToken);
            profile = Profiler.Profile(sampled.Sample, pair.Thresholds);
            unmeasurable = Measurability.Assess(profile, sampled.Figures, pair.Thresholds, pair.X, pair.Y);
            if (unmeasurable is null)
            {
                baseline = await baselines.GetOrBuildAsync(pair, startedAt, cancellationToken);
                var previous = await store.GetRunsAsync(pair.Name, 1, includePoints: false, cancellationToken, before: startedAt);
                findings = FindingEngine.Assess(
                    profile, sampled.Sample, sampled.Figures, baseline, pair.Declared, pair.Thresholds, pair.X, pair.Y, startedAt, previous.Count > 0 ? previous[0].Findings : null);
                findings = await NameDrivingRowsAsync(adapter, pair, profile, findings, startedAt, cancellationToken);
            }
            else
            {
                // Nothing was measured, so nothing is compared and no baseline is built from (or for) this run;
                // whether one is stored is still worth saying.
                logger.LogWarning("Check of {Pair} could not measure: {Reason}", pair.Name, unmeasurable);
                hasStoredBaseline = await store.GetBaselineAsync(pair.Name, cancellationToken) is not null;
            }
        }
        catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
        {
            error = "check cancelled before it finished (shutdown)";
        }
        catch (SourceException ex)
        {
            error = ex.Message;
            logger.LogWarning("Check of {Pair} failed ({Failure}): {Error}", pair.Name, ex.Failure, ex.Message);
        }
#pragma warning disable CA1031 // Any fault of one pair (a bug included) becomes that pair's failed run; the others go on.
        catch (Exception ex)
#pragma warning restore CA1031
        {
            error = $"internal error while checking '{pair.Name}': {ex.GetType().Name}: {ex.Message}";
            logger.LogError(ex, "Check of {Pair} failed unexpectedly", pair.Name);
        }

        var finishedAt = time.GetUtcNow();
        var status = error is not null ? RunStatus.Failed : unmeasurable is not null ? RunStatus.Unmeasurable : RunStatus.Succeeded;
        // An unmeasurable run keeps its profile and points: the counts (and any rows) are what people need to see.
        var measured = status != RunStatus.Failed;
        var run = new NewRun(
            pair.Name,
            startedAt,
            finishedAt,
            status,
            error ?? unmeasurable,
            measured ? profile : null,
            status == RunStatus.Succeeded ? findings : [],
            sampled?.Figures,
            measured && sampled?.Sample is { UsedCount: > 0 } points ? points : null,
            sampled?.Method)
        {
            JudgedAgainst = status == RunStatus.Succeeded && baseline is not null ? BaselineSummary.Of(baseline) : null,
            SlotAt = slot,
        };
        // The store, or the worker's spool when the store cannot take it (see RunRecorder).
        var runId = await recorder.RecordAsync(run with { RunKey = runKey });

        if (status == RunStatus.Succeeded)
        {
            logger.LogInformation(
                "Checked {Pair} in {ElapsedMs} ms: n={Used}, r={PearsonR}, shape={Shape}, {FindingCount} findings",
                pair.Name, (long)(finishedAt - startedAt).TotalMilliseconds, profile!.NUsed, profile.PearsonR, profile.Shape, findings.Count);
        }

        return new PairCheckResult(pair, runId, status, run.Error, run.Profile, run.Findings, startedAt, finishedAt, baseline is not null || hasStoredBaseline)
        {
            Window = run.SourceFigures,
            JudgedAgainst = run.JudgedAgainst,
        };
    }

    /// <summary>
    /// When rows outside the sample drive the exact line, asks the source for the handful of rows farthest from the
    /// sample's line (the exact line is pulled through them, so it would hide them) and names them in the finding.
    /// </summary>
    private static async Task<IReadOnlyList<Finding>> NameDrivingRowsAsync(
        IPairSource source, PairConfig pair, RelationshipProfile profile, IReadOnlyList<Finding> findings, DateTimeOffset now, CancellationToken cancellationToken)
    {
        var hidden = findings.FirstOrDefault(f => f.Kind == FindingKind.HiddenRowsDriveLine);
        if (hidden is null || profile.Intercept is not { } a || profile.Slope is not { } b)
        {
            return findings;
        }

        var rows = await source.FarthestFromLineAsync(pair, now, a, b, IPairSource.DefaultDrivingRows, cancellationToken);
        if (rows.Count == 0)
        {
            return findings;
        }

        var listed = string.Join("; ", rows.Select(r => $"{pair.X} = {Output.Figures.Number(r.X)}, {pair.Y} = {Output.Figures.Number(r.Y)}"));
        var named = hidden with { Message = $"{hidden.Message} Rows farthest from the sample's line: {listed}." };
        return [.. findings.Select(f => ReferenceEquals(f, hidden) ? named : f)];
    }
}
