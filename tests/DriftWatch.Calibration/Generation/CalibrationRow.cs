namespace DriftWatch.Calibration.Generation;

/// <summary>One generated row; null is a NULL in the table.</summary>
internal readonly record struct CalibrationRow(double? X, double? Y);
