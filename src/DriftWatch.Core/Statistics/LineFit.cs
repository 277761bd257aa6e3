namespace DriftWatch.Core.Statistics;

/// <summary>
/// Ordinary least squares of v on u for centred, power-of-two-scaled columns (see
/// <see cref="CenteredColumn"/>). All figures here are in scaled units; the profiler unscales them.
/// Residuals are computed row by row, not as Syy − b·Sxy, so a near-perfect fit (NIST Norris,
/// R² = 0.99999) keeps its digits.
/// </summary>
internal sealed class LineFit
{
    private LineFit(double slope, double sxx, double syy, double sxy, double[] residuals, double sse, double maxAbsResidual)
    {
        Slope = slope;
        Sxx = sxx;
        Syy = syy;
        Sxy = sxy;
        Residuals = residuals;
        Sse = sse;
        MaxAbsResidual = maxAbsResidual;
    }

    /// <summary>Scaled slope: Sxy/Sxx.</summary>
    public double Slope { get; }

    public double Sxx { get; }

    public double Syy { get; }

    public double Sxy { get; }

    /// <summary>v − slope·u per row (the intercept is zero for centred columns).</summary>
    public double[] Residuals { get; }

    /// <summary>Σ residual².</summary>
    public double Sse { get; }

    public double MaxAbsResidual { get; }

    public int Count => Residuals.Length;

    /// <summary>1 − SSE/Syy, clamped to [0, 1].</summary>
    public double RSquared => Math.Clamp(1 - (Sse / Syy), 0, 1);

    /// <summary>Requires Sxx &gt; 0.</summary>
    public static LineFit Of(double[] u, double[] v, double sxx, double syy)
    {
        ArgumentNullException.ThrowIfNull(u);
        ArgumentNullException.ThrowIfNull(v);
        int n = u.Length;
        double sxy = 0;
        for (int i = 0; i < n; i++)
        {
            sxy += u[i] * v[i];
        }

        double b = sxy / sxx;
        var residuals = GC.AllocateUninitializedArray<double>(n);
        double sse = 0, maxAbs = 0;
        for (int i = 0; i < n; i++)
        {
            double e = v[i] - (b * u[i]);
            residuals[i] = e;
            sse += e * e;
            maxAbs = Math.Max(maxAbs, Math.Abs(e));
        }

        return new LineFit(b, sxx, syy, sxy, residuals, sse, maxAbs);
    }
}
