using DriftWatch.Calibration.Generation;
using DriftWatch.Core.Findings;

namespace DriftWatch.Calibration.Faults;

/// <summary>
/// One injected fault: its type and size, the healthy family whose pair it is injected into, and the finding
/// kinds that count as catching it (any one of them).
/// </summary>
/// <param name="Size">The fault's magnitude in its own unit: a share of rows, a factor, residual SDs, a percentile; 0 when it has none.</param>
/// <param name="Label">Short, for the detection table (e.g. "unit y×1000").</param>
/// <param name="Rows">A fixed table size for the host (the aggregate row's 5k/60k/300k); null: the family's sizes.</param>
/// <param name="Value">The sentinel value written, for sentinels.</param>
/// <param name="Main">In the quick preset: the size of each fault type the quick run keeps.</param>
internal sealed record FaultCase(
    FaultType Type,
    double Size,
    FaultColumn Column,
    string Label,
    HealthyFamily Host,
    IReadOnlyList<FindingKind> Expected,
    int? Rows = null,
    bool Main = false,
    double? Value = null)
{
    /// <summary>For unit changes: the slope ratio the change causes (y×f: f; x×f: 1/f).</summary>
    public double? SlopeRatio => Type == FaultType.UnitChange ? (Column == FaultColumn.Y ? Size : 1 / Size) : null;

    /// <summary>Unit changes must be critical and name the factor; the others need an alert of an expected kind.</summary>
    public bool IsUnit => Type == FaultType.UnitChange;
}
