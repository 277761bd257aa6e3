using System.Globalization;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Triage;
using DriftWatch.Monitoring;
using DriftWatch.Store;

namespace DriftWatch.Triage;

/// <summary>
/// The triage actions, shared by the CLI (<c>alerts ack|snooze|unsnooze</c>, <c>baseline accept|reset</c>) and
/// the dashboard's forms: each does the change in the store and then records who, when and why in the audit
/// log. One copy of the logic, whichever door a person comes through. Nothing is recorded for a change that did
/// not happen (an unknown alert, a refused run).
/// </summary>
internal sealed class TriageActions(IAlertStore alerts, IHistoryStore history, BaselineService baselines, IAuditStore audit, TimeProvider time)
{
    /// <summary>The longest snooze: beyond a month, a pair should be changed or removed in the configuration instead.</summary>
    public static readonly TimeSpan MaxSnooze = TimeSpan.FromDays(31);

    /// <summary>Acknowledges an open alert; null when there is no open alert with that id.</summary>
    public async Task<AlertState?> AckAsync(long alertId, Actor actor, string? reason, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(actor);
        var alert = await alerts.GetAlertAsync(alertId, cancellationToken);
        var now = time.GetUtcNow();
        if (alert is null || !alert.IsOpen || !await alerts.AckAsync(alertId, now, cancellationToken))
        {
            return null;
        }

        var detail = $"{Name(alert.Kind)} ({Name(alert.Severity)}, {Name(alert.Status)})";
        await RecordAsync(now, actor, AuditAction.Ack, alert.Pair, alertId, null, reason, detail, cancellationToken);
        return alert;
    }

    /// <summary>Holds back the pair's notifications for <paramref name="span"/> (1 minute to <see cref="MaxSnooze"/>); returns the end.</summary>
    public async Task<DateTimeOffset> SnoozeAsync(string pair, TimeSpan span, Actor actor, string? reason, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(pair);
        ArgumentNullException.ThrowIfNull(actor);
        ArgumentOutOfRangeException.ThrowIfLessThan(span, TimeSpan.FromMinutes(1));
        ArgumentOutOfRangeException.ThrowIfGreaterThan(span, MaxSnooze);
        var now = time.GetUtcNow();
        var until = now + span;
        await alerts.SnoozeAsync(pair, until, now, reason, cancellationToken);
        await RecordAsync(now, actor, AuditAction.Snooze, pair, null, null, reason, "until " + Time(until), cancellationToken);
        return until;
    }

    /// <summary>Ends the pair's snooze; false (and nothing recorded) when it was not snoozed.</summary>
    public async Task<bool> UnsnoozeAsync(string pair, Actor actor, string? reason, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(actor);
        if (!await alerts.UnsnoozeAsync(pair, cancellationToken))
        {
            return false;
        }

        await RecordAsync(time.GetUtcNow(), actor, AuditAction.Unsnooze, pair, null, null, reason, null, cancellationToken);
        return true;
    }

    /// <summary>
    /// Adopts run <paramref name="runId"/> (or, without one, the latest successful run with points) as the pair's
    /// baseline. A run with warning-or-worse findings is refused unless <paramref name="force"/>: it may be the
    /// intentional change, or the fault the findings describe, and only a person can tell which.
    /// </summary>
    public async Task<AcceptOutcome> AcceptBaselineAsync(PairConfig pair, long? runId, bool force, Actor actor, string? reason, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        ArgumentNullException.ThrowIfNull(actor);
        RunRecord? run;
        if (runId is { } id)
        {
            run = await history.GetRunAsync(id, includePoints: true, cancellationToken);
            if (run is null || run.Pair != pair.Name)
            {
                return new AcceptOutcome(AcceptResult.RunNotFound, null, null, $"'{pair.Name}' has no run {id} (see 'driftwatch history {pair.Name}')");
            }

            if (run.Status != RunStatus.Succeeded || run.Points is not { UsedCount: > 0 })
            {
                var why = run.Status != RunStatus.Succeeded ? $"it is {Name(run.Status)}" : "its sampled points are no longer stored (points retention)";
                return new AcceptOutcome(AcceptResult.RunNotUsable, run, null, $"run {id} of '{pair.Name}' cannot become the baseline: {why}");
            }
        }
        else
        {
            run = await baselines.LatestAcceptableRunAsync(pair.Name, cancellationToken);
            if (run is null)
            {
                return new AcceptOutcome(AcceptResult.NoRun, null, null, $"'{pair.Name}' has no recent successful run with sampled points to accept; run 'driftwatch check --pair {pair.Name}' first");
            }
        }

        if (run.WorstSeverity is { } worst && worst >= Severity.Warning && !force)
        {
            var kinds = string.Join(", ", run.Findings.Where(f => f.Severity >= Severity.Warning).Select(f => Name(f.Kind)).Distinct());
            return new AcceptOutcome(AcceptResult.Refused, run, null,
                $"run {run.Id} of '{pair.Name}' has {Name(worst)} findings ({kinds}); if they are the intended change, accept it anyway with --force (the dashboard asks you to confirm)");
        }

        var now = time.GetUtcNow();
        var baseline = await baselines.AcceptRunAsync(pair, run, now, cancellationToken);
        if (baseline is null)
        {
            return new AcceptOutcome(AcceptResult.RunNotUsable, run, null, $"run {run.Id} of '{pair.Name}' could not be pooled into a baseline");
        }

        var detail = Figures(run) + (run.WorstSeverity >= Severity.Warning ? $"; accepted despite {Name(run.WorstSeverity!.Value)} findings" : string.Empty);
        await RecordAsync(now, actor, AuditAction.BaselineAccept, pair.Name, null, run.Id, reason, detail, cancellationToken);
        return new AcceptOutcome(AcceptResult.Accepted, run, baseline, $"run {run.Id} of '{pair.Name}' is now its baseline");
    }

    /// <summary>Forgets the pair's baseline; the next one is pooled from runs after this moment. Returns whether there was one, and the moment.</summary>
    public async Task<(bool HadBaseline, DateTimeOffset ResetAt)> ResetBaselineAsync(PairConfig pair, Actor actor, string? reason, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        ArgumentNullException.ThrowIfNull(actor);
        var now = time.GetUtcNow();
        var had = await baselines.ResetAsync(pair.Name, now, cancellationToken);
        await RecordAsync(now, actor, AuditAction.BaselineReset, pair.Name, null, null, reason,
            $"{(had ? "baseline forgotten" : "no baseline was stored")}; the next is pooled ({pair.Baseline}) from runs started after {Time(now)}", cancellationToken);
        return (had, now);
    }

    /// <summary>What a run says in one line: its time and headline figures.</summary>
    public static string Figures(RunRecord run)
    {
        ArgumentNullException.ThrowIfNull(run);
        var p = run.Profile;
        return string.Create(CultureInfo.InvariantCulture,
            $"run {run.Id} of {Time(run.StartedAt)}: r {Num(p?.PearsonR)}, slope {Num(p?.Slope)}, {p?.NUsed ?? 0} points used of {p?.NRows ?? 0} rows sampled");
    }

    private Task<long> RecordAsync(DateTimeOffset at, Actor actor, AuditAction action, string? pair, long? alertId, long? runId, string? reason, string? detail, CancellationToken cancellationToken) =>
        audit.AppendAsync(new AuditEntry(0, at, actor.Name, actor.Via, action, pair, alertId, runId, Actor.Clean(reason), detail), cancellationToken);

    private static string Num(double? value) => Output.Figures.Number(value);

    private static string Time(DateTimeOffset at) => at.UtcDateTime.ToString("yyyy-MM-dd HH:mm 'UTC'", CultureInfo.InvariantCulture);

    private static string Name<T>(T value)
        where T : struct, Enum => Output.JsonContract.Name(value);
}
