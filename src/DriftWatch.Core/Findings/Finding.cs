namespace DriftWatch.Core.Findings;

/// <summary>
/// One statistical signal about a pair: not proof, a reason for a person to look.
/// <paramref name="PValue"/> is set where a hypothesis test applies (and is what a
/// false-discovery-rate step adjusts); <paramref name="Effect"/> is the size of the change in the
/// finding's natural unit (Δr, slope ratio, rate difference, …).
/// </summary>
public sealed record Finding(
    FindingKind Kind,
    Severity Severity,
    double? PValue,
    double? Effect,
    string Message);
