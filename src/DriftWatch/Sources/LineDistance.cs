namespace DriftWatch.Sources;

/// <summary>
/// How a source measures a row's distance from the line y = a + b·x without overflow: as
/// y·f − a·f − (b·f)·x, with f a power of two at most 1/4 that also brings |b·f| to at most 1/4. Each of
/// the three terms is then at most a quarter of float64's range, so their sum is finite for every finite
/// row, and since f is a power of two the order of the distances is that of |y − (a + b·x)|. Values whose
/// product with f (or with b·f) would fall below the smallest normal double are read as 0 there: PostgreSQL
/// fails a multiplication that underflows, and such values weigh nothing against a residual.
/// </summary>
internal sealed record LineDistance(double Factor, double ScaledIntercept, double ScaledSlope, double YFloor, double XFloor)
{
    private const double SmallestNormal = 2.2250738585072014e-308;

    public static LineDistance For(double intercept, double slope)
    {
        if (!double.IsFinite(intercept) || !double.IsFinite(slope))
        {
            throw new ArgumentOutOfRangeException(nameof(slope), "The line's intercept and slope must be finite numbers.");
        }

        // |b| < 2^(ILogB(b) + 1), so 2^-(ILogB(b) + 3) brings it below 1/4.
        int exponent = slope == 0 ? -2 : Math.Min(-2, -(Math.ILogB(slope) + 3));
        double factor = Math.ScaleB(1.0, exponent);
        double scaledSlope = slope * factor;
        return new LineDistance(
            factor,
            intercept * factor,
            scaledSlope,
            SmallestNormal / factor,
            scaledSlope == 0 ? 0 : SmallestNormal / Math.Abs(scaledSlope));
    }

    /// <summary>A count a caller may ask for: 1 to <see cref="IPairSource.MaxDrivingRows"/>.</summary>
    public static void CheckCount(int count) =>
        ArgumentOutOfRangeException.ThrowIfNotEqual(count is >= 1 and <= IPairSource.MaxDrivingRows, true, nameof(count));

    /// <summary>y − (a + b·x) as the source ranks it, in the columns' units; ±Infinity beyond float64's range.</summary>
    public double Residual(double x, double y)
    {
        double scaledY = Math.Abs(y) < YFloor ? 0 : y * Factor;
        double scaledSlopeX = Math.Abs(x) < XFloor ? 0 : ScaledSlope * x;
        return (scaledY - ScaledIntercept - scaledSlopeX) / Factor;
    }
}
