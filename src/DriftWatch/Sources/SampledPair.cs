using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Sources;

/// <param name="Sample">The sampled rows (nulls and non-finite values already counted and dropped).</param>
/// <param name="Figures">Exact whole-window aggregates computed in the database; null where the source cannot push down (a query pair on SQLite, say).</param>
/// <param name="Method">How the sample was drawn, for the run record ("tablesample system 2.5%", "random 10000", "all").</param>
internal sealed record SampledPair(PairedSample Sample, SourceFigures? Figures, string Method)
{
    /// <summary>Where the window ended: the check time (anchor <c>now</c>) or the newest value read (anchor <c>latest</c>); null without a window, or when <c>latest</c> found no value.</summary>
    public DateTimeOffset? WindowEnd { get; init; }
}
