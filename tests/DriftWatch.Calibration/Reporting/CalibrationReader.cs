using DriftWatch.Calibration.Generation;
using DriftWatch.Calibration.Running;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Output;
using DriftWatch.Store;

namespace DriftWatch.Calibration.Reporting;

/// <summary>
/// Reads a finished run back from DriftWatch's own store (runs, findings, alert states), not from what the checks
/// returned in memory, so the figures are what the dashboard and the mails were based on.
/// </summary>
internal static class CalibrationReader
{
    public static async Task<(HealthyRates Healthy, IReadOnlyList<FaultOutcome> Faults)> ReadAsync(
        CalibrationPlan plan,
        IHistoryStore history,
        IAlertStore alerts,
        IReadOnlyDictionary<string, int> faultDayRows,
        CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(history);
        ArgumentNullException.ThrowIfNull(alerts);
        ArgumentNullException.ThrowIfNull(faultDayRows);
        var options = plan.Options;
        var runs = new Dictionary<string, IReadOnlyList<RunRecord>>(StringComparer.Ordinal);
        foreach (var pair in plan.Pairs)
        {
            var newestFirst = await history.GetRunsAsync(pair.Name, options.Days + 10, includePoints: false, cancellationToken);
            runs[pair.Name] = [.. newestFirst.OrderBy(r => r.StartedAt).ThenBy(r => r.Id)];
        }

        var since = CalibrationPlan.CheckTimeOf(1).AddDays(-1);
        var allAlerts = (await alerts.ListAlertsAsync(since, int.MaxValue, cancellationToken))
            .GroupBy(a => a.Pair, StringComparer.Ordinal)
            .ToDictionary(g => g.Key, g => g.ToArray(), StringComparer.Ordinal);
        AlertState[] AlertsOf(string pair) => allAlerts.TryGetValue(pair, out var list) ? list : [];

        var healthy = ReadHealthy(plan, runs, AlertsOf);
        var faults = plan.Pairs
            .Where(p => p.Fault is not null)
            .Select(p => Judge(p, options.FaultDay, runs[p.Name], AlertsOf(p.Name), faultDayRows.GetValueOrDefault(p.Name)))
            .ToArray();
        return (healthy, faults);
    }

    private static HealthyRates ReadHealthy(CalibrationPlan plan, Dictionary<string, IReadOnlyList<RunRecord>> runs, Func<string, AlertState[]> alertsOf)
    {
        var first = plan.Options.BaselineDays + 1;
        var findings = new Dictionary<string, int>(StringComparer.Ordinal);
        var confirmed = new Dictionary<string, int>(StringComparer.Ordinal);
        var families = new List<FamilyCount>();
        var samples = new List<string>();
        int checks = 0, findingCount = 0, confirmedCount = 0, unmeasuredBaseline = 0, unmeasuredMonitored = 0;
        foreach (var group in plan.Pairs.Where(p => p.Healthy).GroupBy(p => p.Family))
        {
            int fChecks = 0, fFindings = 0, fConfirmed = 0, fUnmeasured = 0;
            foreach (var pair in group)
            {
                foreach (var run in runs[pair.Name])
                {
                    var day = CalibrationPlan.DayOf(run.StartedAt);
                    var monitored = day >= first;
                    if (run.Status != RunStatus.Succeeded)
                    {
                        fUnmeasured++;
                        if (monitored)
                        {
                            unmeasuredMonitored++;
                        }
                        else
                        {
                            unmeasuredBaseline++;
                        }

                        if (samples.Count < 5)
                        {
                            samples.Add($"{pair.Name} day {day}: {JsonContract.Name(run.Status)}: {run.Error}");
                        }
                    }

                    if (!monitored)
                    {
                        continue;
                    }

                    fChecks++;
                    foreach (var finding in run.Findings.Where(f => f.Severity >= Severity.Warning))
                    {
                        fFindings++;
                        Add(findings, JsonContract.Name(finding.Kind));
                    }
                }

                foreach (var alert in alertsOf(pair.Name).Where(a => a.ConfirmedAt is { } at && CalibrationPlan.DayOf(at) >= first))
                {
                    fConfirmed++;
                    Add(confirmed, JsonContract.Name(alert.Kind));
                }
            }

            checks += fChecks;
            findingCount += fFindings;
            confirmedCount += fConfirmed;
            families.Add(new FamilyCount(HealthyFamilies.Name(group.Key), group.Count(), fChecks, fFindings, fConfirmed, fUnmeasured));
        }

        var kinds = findings.Keys.Union(confirmed.Keys)
            .Select(k => new KindCount(k, findings.GetValueOrDefault(k), confirmed.GetValueOrDefault(k)))
            .OrderByDescending(k => k.Findings).ThenByDescending(k => k.Confirmed).ThenBy(k => k.Kind, StringComparer.Ordinal)
            .ToArray();
        return new HealthyRates(plan.Pairs.Count(p => p.Healthy), checks, findingCount, confirmedCount, unmeasuredBaseline, unmeasuredMonitored, kinds, families, samples);
    }

    private static FaultOutcome Judge(CalibrationPair pair, int faultDay, IReadOnlyList<RunRecord> runs, AlertState[] alerts, int rows)
    {
        var fault = pair.Fault!;
        var last = faultDay + 1;

        // An alert counts when it was confirmed by the second check after injection and was seen from the first one on
        // (an alert cleared before the fault and confirmed earlier is not news of it).
        var inTime = alerts
            .Where(a => a.ConfirmedAt is { } at && CalibrationPlan.DayOf(at) <= last && CalibrationPlan.DayOf(a.LastSeen) >= faultDay)
            .ToArray();
        var caught = inTime.Where(a => fault.Expected.Contains(a.Kind)).OrderBy(a => a.ConfirmedAt).ToArray();
        var window = runs.Where(r => CalibrationPlan.DayOf(r.StartedAt) is var d && d >= faultDay && d <= last).ToArray();
        var expectedFindings = window.SelectMany(r => r.Findings).Where(f => fault.Expected.Contains(f.Kind)).ToArray();
        // From the two checks' findings, not the alert's stored state, which later days may have changed.
        Severity? severity = expectedFindings.Length > 0 ? expectedFindings.Max(f => f.Severity) : null;

        var firstWith = window.FirstOrDefault(r => r.Findings.Count > 0 || r.Status != RunStatus.Succeeded);
        var first = firstWith is null ? []
            : firstWith.Status != RunStatus.Succeeded ? [$"{JsonContract.Name(firstWith.Status)}{DayMark(firstWith, faultDay)}"]
            : firstWith.Findings
                .OrderByDescending(f => f.Severity)
                .Select(f => $"{JsonContract.Name(f.Kind)} {JsonContract.Name(f.Severity)}{DayMark(firstWith, faultDay)}")
                .Distinct(StringComparer.Ordinal)
                .ToArray();

        bool? critical = null, named = null;
        if (fault.SlopeRatio is { } ratio)
        {
            var slopes = window.SelectMany(r => r.Findings).Where(f => f.Kind == FindingKind.SlopeShift).ToArray();
            critical = slopes.Any(f => f.Severity == Severity.Critical);
            named = slopes.Any(f => UnitFactorNaming.Names(f.Message, ratio));
        }

        return new FaultOutcome(
            fault,
            pair.Name,
            HealthyFamilies.Name(pair.Family),
            pair.Storage.ToString().ToLowerInvariant(),
            rows,
            caught.Length > 0,
            caught.Length > 0 ? CalibrationPlan.DayOf(caught[0].ConfirmedAt!.Value) : null,
            inTime.Length > 0,
            [.. inTime.Select(a => JsonContract.Name(a.Kind)).Distinct(StringComparer.Ordinal)],
            severity,
            first,
            critical,
            named,
            runs.Count(r => r.Status != RunStatus.Succeeded));
    }

    private static string DayMark(RunRecord run, int faultDay) =>
        CalibrationPlan.DayOf(run.StartedAt) == faultDay ? string.Empty : "@d+1";

    private static void Add(Dictionary<string, int> counts, string key) => counts[key] = counts.GetValueOrDefault(key) + 1;
}
