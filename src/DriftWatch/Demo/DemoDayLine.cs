using System.Globalization;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using DriftWatch.Output;

namespace DriftWatch.Demo;

/// <summary>
/// The one progress line per simulated day: what was checked and what is new since the day before
/// ("day 08  2026-11-08  6 pairs checked  1 new finding: declared-vs-weighed became_perfect (critical)").
/// </summary>
internal sealed class DemoDayLine
{
    private readonly Dictionary<string, HashSet<FindingKind>> _previous = new(StringComparer.Ordinal);
    private readonly HashSet<string> _failing = new(StringComparer.Ordinal);

    public IReadOnlyList<string> Describe(int day, CheckPassResult pass)
    {
        ArgumentNullException.ThrowIfNull(pass);
        var results = pass.Checks;
        var newFindings = new List<string>();
        var failed = new List<PairCheckResult>();
        var unmeasurable = new List<PairCheckResult>();
        foreach (var result in results)
        {
            if (result.Status != RunStatus.Succeeded)
            {
                (result.Status == RunStatus.Failed ? failed : unmeasurable).Add(result);
                continue;
            }

            _failing.Remove(result.Pair.Name);
            var before = _previous.GetValueOrDefault(result.Pair.Name) ?? [];
            foreach (var finding in result.Findings.Where(f => !before.Contains(f.Kind)).DistinctBy(f => f.Kind))
            {
                newFindings.Add($"{result.Pair.Name} {JsonContract.Name(finding.Kind)} ({JsonContract.Name(finding.Severity)})");
            }

            _previous[result.Pair.Name] = [.. result.Findings.Select(f => f.Kind)];
        }

        var head = string.Create(CultureInfo.InvariantCulture, $"day {day:00}  {TerminalScenario.DateOf(day):yyyy-MM-dd}  {results.Count} pairs checked");
        var parts = new List<string>();
        if (day <= TerminalScenario.BaselineRuns)
        {
            parts.Add(string.Create(CultureInfo.InvariantCulture, $"baseline run {day} of {TerminalScenario.BaselineRuns}"));
        }

        if (failed.Count > 0)
        {
            parts.Add($"{failed.Count} failed: {string.Join(", ", failed.Select(f => f.Pair.Name))}");
        }

        if (unmeasurable.Count > 0)
        {
            parts.Add($"{unmeasurable.Count} unmeasurable: {string.Join(", ", unmeasurable.Select(f => f.Pair.Name))}");
        }

        parts.Add(newFindings.Count switch
        {
            0 => "no new findings",
            1 => "1 new finding: " + newFindings[0],
            _ => $"{newFindings.Count} new findings: {string.Join(", ", newFindings)}",
        });

        var lines = new List<string> { head + "  " + string.Join("  ", parts) };

        // A failure's (or an empty window's) reason once, on the day it starts; the following days only name the pair.
        foreach (var result in failed.Concat(unmeasurable).Where(f => _failing.Add(f.Pair.Name)))
        {
            lines.Add($"        {result.Pair.Name}: {result.Error}");
        }

        var notices = pass.AlertCycles.SelectMany(c => c.Decision.Notifications).ToArray();
        if (notices.Length > 0 || pass.Delivery.Sent > 0)
        {
            var said = notices.Select(n => $"{JsonContract.Name(n.Kind)} {n.Alert.Pair} {JsonContract.Name(n.Alert.Kind)}");
            lines.Add(string.Create(CultureInfo.InvariantCulture, $"        alerts: {string.Join(", ", said)}; {pass.Delivery.Sent} mail{(pass.Delivery.Sent == 1 ? "" : "s")} written"));
        }

        return lines;
    }
}
