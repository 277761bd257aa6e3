namespace DriftWatch.Core.History;

/// <summary>
/// One row of a pair's window, read from the source because it lies far from a given line y = a + b·x
/// (the exact whole-window line, say): when the exact figures and the sample disagree, such rows outside
/// the sample are the usual reason. <see cref="Residual"/> is y − (a + b·x), signed; it is ±Infinity only
/// when the distance itself lies beyond float64's range.
/// </summary>
public sealed record DrivingRow(double X, double Y, double Residual);
