using DriftWatch.Calibration.Generation;

namespace DriftWatch.Calibration.Faults;

/// <summary>The least-squares line of one day's complete rows, for faults that follow the pair's own line.</summary>
internal sealed record DayLine(double Intercept, double Slope, double ResidualSd, double XMean)
{
    public static DayLine Fit(IReadOnlyList<CalibrationRow> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var xs = new List<double>(rows.Count);
        var ys = new List<double>(rows.Count);
        foreach (var r in rows)
        {
            if (r is { X: { } x, Y: { } y })
            {
                xs.Add(x);
                ys.Add(y);
            }
        }

        var (intercept, slope) = MathNet.Numerics.Fit.Line([.. xs], [.. ys]);
        var ss = 0.0;
        for (var i = 0; i < xs.Count; i++)
        {
            var e = ys[i] - intercept - (slope * xs[i]);
            ss += e * e;
        }

        return new DayLine(intercept, slope, Math.Sqrt(ss / Math.Max(1, xs.Count - 2)), xs.Average());
    }
}
