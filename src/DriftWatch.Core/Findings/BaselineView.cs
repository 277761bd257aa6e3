using DriftWatch.Core.Baselines;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.Findings;

/// <summary>
/// What a comparison needs of a baseline: its runs' own figures (the normal range) and the pooled profile and
/// points (shape, plots, the Kolmogorov–Smirnov tests).
/// </summary>
/// <param name="Runs">The pooled runs' figures; never empty (a baseline without them stands as one run).</param>
/// <param name="CompareRowCounts">
/// Row counts mean something: runs of one window. Two extracts compared by <c>profile</c> have whatever lengths
/// they were cut to, so their counts are not compared.
/// </param>
internal sealed record BaselineView(IReadOnlyList<RunFigures> Runs, RelationshipProfile Pooled, PairedSample Points, bool CompareRowCounts = true)
{
    public static BaselineView Of(RelationshipProfile pooled, PairedSample points, IReadOnlyList<RunFigures>? runs, Statistics.Thresholds t, bool compareRowCounts = true) =>
        new(runs is { Count: > 0 } ? runs : [RunFigures.Of(0, default, pooled, null, t)], pooled, points, compareRowCounts);

    /// <summary>Mean of a figure over the runs that have it; null when none has it.</summary>
    public double? Mean(Func<RunFigures, double?> figure) => RunFigures.Mean(Runs, figure);

    /// <summary>At least half of the runs have the property: it is the pair's normal state, not news.</summary>
    public bool Mostly(Func<RunFigures, bool> property) => Runs.Count(property) * 2 >= Runs.Count;

    /// <summary>Some baseline run had the property already.</summary>
    public bool Ever(Func<RunFigures, bool> property) => Runs.Any(property);
}
