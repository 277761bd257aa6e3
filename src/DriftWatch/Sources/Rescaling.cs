using DriftWatch.Core.History;

namespace DriftWatch.Sources;

/// <summary>
/// The push-down aggregate's second form, for values the database's float8 aggregates cannot take as they
/// are: it runs on x' = x·2^XExponent − XShift (and likewise y), computed from each column's range over the
/// window. The power of two brings the largest |value| into [2^64, 2^65), where sums of squares and their
/// product (PostgreSQL's corr() multiplies Sxx by Syy) stay far from overflow for any row count, and it
/// changes no digit; the shift, the scaled middle of the range, centres the values, so a small spread on a
/// huge offset (64-bit integers near 2^63) keeps its digits in PostgreSQL's one-pass updating sums. r is
/// unchanged, every other figure is mapped back; one beyond float64's range once mapped back (the variance
/// of values near 1e300) comes back as null.
/// </summary>
internal sealed record Rescaling(int XExponent, int YExponent, double XShift, double YShift)
{
    /// <summary>The scaled columns' largest |value| lies in [2^Target, 2^(Target + 1)).</summary>
    private const int Target = 64;

    // The factor itself must be a finite double.
    private const int MaxExponent = 1000;

    /// <summary>
    /// The first form is trusted while √n · |mean| / SD · ε stays below this for both columns: that is the
    /// usual size of the relative error of one-pass updating sums (Chan, Golub and LeVeque 1983, from memory:
    /// the error grows with n and with the condition number |mean| / SD). Ordinary data stay below 1e-12.
    /// </summary>
    private const double MaxRelativeError = 1e-8;

    public double XFactor => Math.ScaleB(1.0, XExponent);

    public double YFactor => Math.ScaleB(1.0, YExponent);

    /// <summary>
    /// Values of x below this |value| scale to less than the smallest normal double; they are read as 0, which
    /// PostgreSQL's multiplication would otherwise refuse as an underflow. Against the column's largest value
    /// (2^64 once scaled) they weigh less than 2^-1086 in every figure.
    /// </summary>
    public double XFloor => Math.ScaleB(1.0, -1022 - XExponent);

    public double YFloor => Math.ScaleB(1.0, -1022 - YExponent);

    /// <summary>From each column's smallest and largest usable value (null when there is none).</summary>
    public static Rescaling For(double? minX, double? maxX, double? minY, double? maxY)
    {
        var (ex, sx) = Column(minX, maxX);
        var (ey, sy) = Column(minY, maxY);
        return new Rescaling(ex, ey, sx, sy);
    }

    /// <summary>
    /// True when the plain aggregate cannot be trusted: PostgreSQL's corr() divides Sxy by √(Sxx·Syy) and
    /// returns 0 when that product overflows (values from about 1e77), or the values' spread is too small
    /// against their magnitude for one-pass sums (see <see cref="MaxRelativeError"/>).
    /// </summary>
    public static bool Needed(SourceFigures figures)
    {
        ArgumentNullException.ThrowIfNull(figures);
        if (figures.UsedCount < 2 || figures.XVariance is not { } vx || figures.YVariance is not { } vy)
        {
            return false;
        }

        double n1 = figures.UsedCount - 1;
        return !double.IsFinite(vx * n1 * (vy * n1))
            || LosesDigits(figures.XMean, vx, figures.UsedCount)
            || LosesDigits(figures.YMean, vy, figures.UsedCount);
    }

    /// <summary>The figures of the original columns from those of the rescaled ones.</summary>
    public SourceFigures Restore(SourceFigures rescaled)
    {
        ArgumentNullException.ThrowIfNull(rescaled);
        double? intercept = rescaled.Intercept is { } a && rescaled.Slope is { } b ? a - (b * XShift) + YShift : null;
        return rescaled with
        {
            Slope = Finite(rescaled.Slope, XExponent - YExponent),
            Intercept = Finite(intercept, -YExponent),
            XMean = Finite(rescaled.XMean + XShift, -XExponent),
            YMean = Finite(rescaled.YMean + YShift, -YExponent),
            XVariance = Finite(rescaled.XVariance, -2 * XExponent),
            YVariance = Finite(rescaled.YVariance, -2 * YExponent),
        };
    }

    private static bool LosesDigits(double? mean, double variance, long n) =>
        mean is { } m && variance > 0 && Math.Sqrt(n) * Math.Abs(m) / Math.Sqrt(variance) * Math.ScaleB(1.0, -52) > MaxRelativeError;

    private static (int Exponent, double Shift) Column(double? min, double? max)
    {
        if (min is not { } lo || max is not { } hi || !double.IsFinite(lo) || !double.IsFinite(hi))
        {
            return (0, 0);
        }

        double maxAbs = Math.Max(Math.Abs(lo), Math.Abs(hi));
        int exponent = maxAbs > 0 ? Math.Min(Target - Math.ILogB(maxAbs), MaxExponent) : 0;
        double factor = Math.ScaleB(1.0, exponent);
        // Halves first: the sum of two values near double.MaxValue would overflow.
        return (exponent, (lo * factor * 0.5) + (hi * factor * 0.5));
    }

    private static double? Finite(double? value, int exponent) =>
        value is { } v && Math.ScaleB(v, exponent) is var s && double.IsFinite(s) ? s : null;
}
