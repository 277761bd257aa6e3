using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Dashboard.Data;

/// <summary>
/// One pair as the overview shows it. <see cref="Config"/> is null for a pair that has history in the store
/// but is no longer configured; <see cref="Latest"/> is the newest run whatever its outcome.
/// </summary>
internal sealed record PairSummary(
    string Name,
    PairConfig? Config,
    PairStatus Status,
    RunRecord? Latest,
    StoredBaseline? Baseline,
    IReadOnlyList<AlertState> OpenAlerts)
{
    public RelationshipProfile? Current => Latest is { Status: RunStatus.Succeeded } run ? run.Profile : null;

    /// <summary>Current r minus the baseline's; null when either is undefined.</summary>
    public double? DeltaR => Current?.PearsonR is { } r && Baseline?.Profile.PearsonR is { } r0 ? r - r0 : null;

    /// <summary>Current slope over the baseline's: 1 is unchanged, 2.2 a pound/kilogram mix-up.</summary>
    public double? SlopeRatio =>
        Current?.Slope is { } b && Baseline?.Profile.Slope is { } b0 && b0 != 0 && double.IsFinite(b / b0) ? b / b0 : null;

    public Severity? WorstOpenSeverity => OpenAlerts.Count == 0 ? null : OpenAlerts.Max(a => a.Severity);

    public string? Source => Config?.Source;

    public IReadOnlyList<string> Tags => Config?.Tags ?? [];
}
