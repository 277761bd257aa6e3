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
    /// <summary>How many of a pair's latest runs are searched for one that already read the same load (anchor latest).</summary>
    public const int RepeatLookback = 50;

    public Task<PairCheckResult> CheckAsync(PairConfig pair, CancellationToken cancellationToken) => CheckAsync(pair, asOf: null, shared: null, slot: null, cancellationToken);

    /// <param name="asOf">
    /// Check as of this past time (<c>check --as-of</c>): the window ends there (anchor now) or at the newest value at
    /// or before it (anchor latest), and the run is recorded at that time, marked back-dated (see <see cref="NewRun.BackDatedAt"/>).
    /// </param>
    public Task<PairCheckResult> CheckAsync(PairConfig pair, DateTimeOffset? asOf, CancellationToken cancellationToken) =>
        CheckAsync(pair, asOf, shared: null, slot: null, cancellationToken);

    /// <summary>
    /// With <paramref name="shared"/> the pair's rows come from its group's shared read (<see cref="TableGroups"/>)
    /// instead of a read of its own, and the check starts when that read started, the anchor of its window.
    /// A shared read is never back-dated: groups form only for checks of now.
    /// </summary>
    public Task<PairCheckResult> CheckAsync(PairConfig pair, SharedRead? shared, CancellationToken cancellationToken) =>
        CheckAsync(pair, asOf: null, shared, slot: null, cancellationToken);

    /// <summary>A scheduled check: as with <paramref name="shared"/> above, and the run records the schedule <paramref name="slot"/> it was for.</summary>
    /// <param name="slot">The schedule slot this check is for (recorded with the run); null for checks not started by the schedule.</param>
    public Task<PairCheckResult> CheckSlotAsync(PairConfig pair, SharedRead? shared, DateTimeOffset? slot, CancellationToken cancellationToken) =>
        CheckAsync(pair, asOf: null, shared, slot, cancellationToken);

    private async Task<PairCheckResult> CheckAsync(PairConfig pair, DateTimeOffset? asOf, SharedRead? shared, DateTimeOffset? slot, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        using var _ = LogContext.PushProperty("Pair", pair.Name);
        var madeAt = time.GetUtcNow();
        // The check's own time: what the window, the baseline and the comparisons are relative to, and where the run is recorded.
        var startedAt = asOf ?? shared?.StartedAt ?? madeAt;
        if (await FindRepeatAsync(pair, startedAt, cancellationToken) is { } repeat)
        {
            return repeat;
        }

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
            sampled = shared?.Read.Value ?? await adapter.SampleAsync(pair, startedAt, cancellationToken);
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

        // A check of now ends now (a shared read started before this pair's part of it); a back-dated one lasts as long after its as-of time.
        var finishedAt = asOf is null ? time.GetUtcNow() : startedAt + (time.GetUtcNow() - madeAt);
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
            WindowEnd = sampled?.WindowEnd,
            BackDatedAt = asOf is null ? null : madeAt,
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
            WindowEnd = run.WindowEnd,
            BackDated = asOf is not null,
        };
    }

    /// <summary>
    /// With anchor latest, the same load is found again at every check until the next one lands. When one of the
    /// pair's last <see cref="RepeatLookback"/> runs already read a window ending at the same newest value (and measured
    /// it, or found nothing to measure), this check is that run again: nothing is sampled or recorded, so identical
    /// data never counts twice toward alert confirmation or a baseline, and the earlier run's result is returned.
    /// A failure here is not the check's to report: the check then runs as usual and records what it finds.
    /// </summary>
    private async Task<PairCheckResult?> FindRepeatAsync(PairConfig pair, DateTimeOffset at, CancellationToken cancellationToken)
    {
        if (pair.Window is not { Anchor: WindowAnchor.Latest })
        {
            return null;
        }

        try
        {
            var source = (live?.Current ?? config).FindSource(pair.Source);
            if (source is null || await sources.Create(source).LatestAsync(pair, at, cancellationToken) is not { } newest)
            {
                return null;
            }

            var recent = await store.GetRunsAsync(pair.Name, RepeatLookback, includePoints: false, cancellationToken);
            var same = recent.FirstOrDefault(r =>
                r.Status is RunStatus.Succeeded or RunStatus.Unmeasurable
                && r.WindowEnd?.ToUnixTimeMilliseconds() == newest.ToUnixTimeMilliseconds());
            if (same is null)
            {
                return null;
            }

            logger.LogInformation(
                "Check of {Pair} is a repeat: the window still ends at the newest {Column} {WindowEnd:O}, already checked by run {RunId}; nothing recorded",
                pair.Name, pair.Window.Column, newest, same.Id);
            return new PairCheckResult(pair, same.Id, same.Status, same.Error, same.Profile, same.Findings, same.StartedAt, same.FinishedAt, same.JudgedAgainst is not null)
            {
                Window = same.SourceFigures,
                JudgedAgainst = same.JudgedAgainst,
                WindowEnd = same.WindowEnd,
                BackDated = same.BackDatedAt is not null,
                RepeatOf = same.Id,
            };
        }
        catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
        {
            throw;
        }
#pragma warning disable CA1031 // The lookup is an optimisation of the check: whatever fails here, the check itself runs and reports it.
        catch (Exception ex)
#pragma warning restore CA1031
        {
            logger.LogDebug(ex, "Could not tell whether the check of {Pair} repeats an earlier one; checking", pair.Name);
            return null;
        }
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
