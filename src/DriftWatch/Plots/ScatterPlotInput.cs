using DriftWatch.Core.Profiling;

namespace DriftWatch.Plots;

/// <summary>
/// What a baseline-versus-current scatter plot shows. Either side may be missing (no baseline yet, a failed
/// run); a profile supplies the fitted line (its intercept and slope) over the x range of its points.
/// </summary>
internal sealed record ScatterPlotInput(
    string XName,
    string YName,
    PairedSample? BaselinePoints,
    RelationshipProfile? BaselineProfile,
    PairedSample? CurrentPoints,
    RelationshipProfile? CurrentProfile,
    string? Title = null);
