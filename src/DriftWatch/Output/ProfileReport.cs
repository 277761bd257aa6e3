using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Output;

/// <summary>What <c>profile</c> found: one extract's profile, optionally a baseline's, and the findings.</summary>
/// <param name="Labels">Names for people (columns, files); the table shows them, the JSON contract does not.</param>
/// <param name="Unmeasurable">Why the current extract has nothing to measure (then there are no findings); null when it has.</param>
internal sealed record ProfileReport(
    RelationshipProfile Current,
    RelationshipProfile? Baseline,
    IReadOnlyList<Finding> Findings,
    ProfileLabels Labels,
    string? Unmeasurable = null);

/// <param name="CurrentSource">Where the current extract came from ("orders.csv", "bundled sample").</param>
internal sealed record ProfileLabels(string XName, string YName, string CurrentSource, string? BaselineSource)
{
    /// <summary>What the main profile is called in the table ("current"; "baseline" when <c>baseline show</c> prints a pooled baseline).</summary>
    public string CurrentWord { get; init; } = "current";
}
