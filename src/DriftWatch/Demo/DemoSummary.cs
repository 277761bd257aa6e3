using System.Globalization;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Output;
using DriftWatch.Store;

namespace DriftWatch.Demo;

/// <summary>
/// Reads the outcome back from DriftWatch's own store, not from what the checks returned in memory, so the
/// summary shows what a person (or the dashboard) would find there afterwards.
/// </summary>
internal static class DemoSummary
{
    public static async Task<DemoOutcome> BuildAsync(IHistoryStore history, IAlertStore alerts, int days, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(history);
        ArgumentNullException.ThrowIfNull(alerts);
        var runs = new Dictionary<string, IReadOnlyList<RunRecord>>(StringComparer.Ordinal);
        foreach (var pair in TerminalScenario.Pairs)
        {
            var newestFirst = await history.GetRunsAsync(pair.Name, days + 10, includePoints: false, cancellationToken);
            runs[pair.Name] = [.. newestFirst.OrderBy(r => r.StartedAt).ThenBy(r => r.Id)];
        }

        var alertStates = await alerts.ListAlertsAsync(TerminalScenario.FirstDay.AddDays(-1), 10_000, cancellationToken);

        var faults = TerminalScenario.Faults
            .Select(f => Judge(f, runs[f.Pair], alertStates, days))
            .ToArray();

        var control = runs[TerminalScenario.Control.Name];
        var falseAlarms = control
            .SelectMany(r => r.Findings.Where(f => f.Severity >= Severity.Warning).Select(f => (Day: TerminalScenario.DayOf(r.StartedAt), Finding: f)))
            .Select(a => string.Create(CultureInfo.InvariantCulture, $"day {a.Day:00}: {JsonContract.Name(a.Finding.Kind)} ({JsonContract.Name(a.Finding.Severity)}): {a.Finding.Message}"))
            .ToArray();
        return new DemoOutcome(
            days,
            faults,
            control.Count,
            falseAlarms.Length,
            control.Sum(r => r.Findings.Count),
            control.Count(r => r.Status != RunStatus.Succeeded),
            falseAlarms);
    }

    private static FaultOutcome Judge(ScenarioFault fault, IReadOnlyList<RunRecord> runs, IReadOnlyList<AlertState> alerts, int days)
    {
        var confirmed = alerts
            .Where(a => a.Pair == fault.Pair && a.Kind == fault.Expected && a.ConfirmedAt is { } at && TerminalScenario.DayOf(at) >= fault.Day)
            .Select(a => (int?)TerminalScenario.DayOf(a.ConfirmedAt!.Value))
            .Min();
        if (fault.Day > days)
        {
            return new FaultOutcome(fault, FaultVerdict.NotReached, null, null, null);
        }

        var window = runs.Where(r => TerminalScenario.DayOf(r.StartedAt) is var d && d >= fault.Day && d <= fault.Deadline);
        int? detected = null;
        string? evidence = null;
        if (fault.Expected == FindingKind.CheckFailing)
        {
            // check_failing is not a finding of a run but the alert lifecycle's verdict on failed runs in a row:
            // it counts when that alert was confirmed; the evidence is the failed check's error.
            var failed = window.FirstOrDefault(r => r.Status is RunStatus.Failed or RunStatus.Unmeasurable);
            if (failed is not null && confirmed is { } d && d <= fault.Deadline)
            {
                detected = d;
                evidence = failed.Error;
            }
        }
        else
        {
            foreach (var run in window)
            {
                if (run.Findings.FirstOrDefault(f => f.Kind == fault.Expected) is { } finding)
                {
                    detected = TerminalScenario.DayOf(run.StartedAt);
                    evidence = $"{JsonContract.Name(finding.Severity)}: {finding.Message}";
                    break;
                }
            }
        }

        var verdict = detected is not null ? FaultVerdict.Caught
            : fault.Deadline > days ? FaultVerdict.NotYet
            : FaultVerdict.Missed;
        return new FaultOutcome(fault, verdict, detected, evidence, confirmed);
    }
}
