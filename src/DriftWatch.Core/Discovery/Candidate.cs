using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.Discovery;

/// <summary>
/// A pair worth watching: |r| over the whole table at or above the bound. <see cref="R"/> and <see cref="N"/> are
/// the table's (pairwise-complete finite rows); the shape and Spearman's ρ come from the shared sample's profile.
/// </summary>
public sealed record Candidate(string X, string Y, double R, long N, double? Spearman, Shape Shape, string? ShapeReason, int SampleRows, double? DerivedShare);
