namespace DriftWatch.Calibration.Faults;

/// <summary>What goes wrong in a pair's data from the fault day on.</summary>
internal enum FaultType
{
    CopyXIntoY,
    AffineDerivation,
    UnitChange,
    SlopeChange,
    Offset,
    KeyMisalignment,
    Sentinel,
    Nulls,
    SignFlip,
    RowsCut,
    Cap,
    AggregateRow,
}

/// <summary>Which column a fault changes.</summary>
internal enum FaultColumn
{
    Y,
    X,
}
