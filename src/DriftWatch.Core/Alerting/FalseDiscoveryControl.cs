using DriftWatch.Core.Findings;

namespace DriftWatch.Core.Alerting;

/// <summary>
/// Keeps the share of false alarms among many tested pairs near q: the Benjamini–Hochberg step-up procedure
/// (Benjamini &amp; Hochberg 1995, J. R. Statist. Soc. B 57(1):289–300). Written here because MathNet.Numerics
/// has no multiple-testing routine, and the procedure is a sort and one pass.
/// </summary>
public static class FalseDiscoveryControl
{
    /// <summary>
    /// The items that survive at level <paramref name="q"/>, in their original order. Items whose p-value is
    /// null (or not finite) are not tests: they pass untouched and do not count towards m.
    /// </summary>
    public static IReadOnlyList<T> BenjaminiHochberg<T>(IReadOnlyList<T> items, Func<T, double?> p, double q)
    {
        ArgumentNullException.ThrowIfNull(items);
        ArgumentNullException.ThrowIfNull(p);
        if (!(q > 0 && q <= 1))
        {
            throw new ArgumentOutOfRangeException(nameof(q), q, "q must lie in (0, 1].");
        }

        var tested = new List<(int Index, double P)>();
        for (var i = 0; i < items.Count; i++)
        {
            if (p(items[i]) is { } value && double.IsFinite(value))
            {
                tested.Add((i, value));
            }
        }

        // Stable sort so ties keep their input order (they share the same fate anyway).
        var ranked = tested.OrderBy(t => t.P).ToArray();
        var m = ranked.Length;
        var cutoff = 0; // the largest rank k with p(k) <= k/m * q; ranks 1..k are rejected (kept as findings).
        for (var k = m; k >= 1; k--)
        {
            if (ranked[k - 1].P <= k * q / m)
            {
                cutoff = k;
                break;
            }
        }

        var rejected = new HashSet<int>(ranked.Take(cutoff).Select(t => t.Index));
        var testedIndexes = new HashSet<int>(tested.Select(t => t.Index));
        var result = new List<T>(items.Count);
        for (var i = 0; i < items.Count; i++)
        {
            if (!testedIndexes.Contains(i) || rejected.Contains(i))
            {
                result.Add(items[i]);
            }
        }

        return result;
    }

    /// <summary>
    /// Applies the step once over the findings of one cycle (all pairs together) that could start an alert: those
    /// at warning or worse with a p-value, whose (pair, kind) has no open alert yet. Info findings never alert, so
    /// they are not tests here; a finding that continues an open alert is judged by its own run's test and passes
    /// (dropping it would read as "gone" and clear an alert that is still there). A null <paramref name="q"/> turns
    /// the step off. Findings without a p-value and failed outcomes pass untouched.
    /// </summary>
    public static IReadOnlyList<PairOutcome> FilterCycle(
        IReadOnlyList<PairOutcome> outcomes, double? q, IReadOnlyCollection<(string Pair, FindingKind Kind)>? open = null)
    {
        ArgumentNullException.ThrowIfNull(outcomes);
        if (q is null)
        {
            return outcomes;
        }

        var continuing = open is null ? [] : new HashSet<(string Pair, FindingKind Kind)>(open);
        var all = outcomes
            .SelectMany((o, i) => o.Findings.Select(f => (Outcome: i, Finding: f, Tested: f.Severity >= Severity.Warning && !continuing.Contains((o.Pair, f.Kind)))))
            .ToArray();
        var kept = BenjaminiHochberg(all, t => t.Tested ? t.Finding.PValue : null, q.Value);
        var keptByOutcome = kept.ToLookup(t => t.Outcome, t => t.Finding);
        return [.. outcomes.Select((o, i) => o with { Findings = [.. keptByOutcome[i]] })];
    }
}
