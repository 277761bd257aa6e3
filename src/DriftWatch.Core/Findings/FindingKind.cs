namespace DriftWatch.Core.Findings;

/// <summary>What changed, or what is wrong with a single profile. Serialised in snake_case.</summary>
public enum FindingKind
{
    // A profile on its own (no baseline needed).
    PerfectRelationship,
    Curvature,
    Outliers,
    SinglePointLeverage,

    // A pair declared exact (declared.exact) that stopped being exact.
    ExactnessLost,

    // Current profile against the baseline.
    BecamePerfect,
    PartlyDerived,
    CorrelationShift,
    SignFlip,
    RelationshipLost,
    SlopeShift,
    OffsetShift,
    CurvatureAppeared,
    OutlierSurge,
    LeverageAppeared,
    NullSurge,
    SampleShrank,
    MarginalShift,

    // The exact whole-window line against the sample's: rows the sample missed drive the exact line.
    HiddenRowsDriveLine,

    // Raised by the monitor, not by the statistics: the pair's check keeps failing.
    CheckFailing,
}
