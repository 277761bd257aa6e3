using DriftWatch.Calibration.Faults;
using DriftWatch.Calibration.Generation;

namespace DriftWatch.Calibration.Running;

/// <summary>One watched pair of the run: its table, its healthy character and, for faulty pairs, its fault.</summary>
internal sealed record CalibrationPair(int Index, string Name, string Table, PairShape Shape, StorageStyle Storage, FaultCase? Fault)
{
    public const string XColumn = "x";
    public const string YColumn = "y";
    public const string TimeColumn = "loaded_at";

    public HealthyFamily Family => Shape.Family;

    public bool Healthy => Fault is null;
}
