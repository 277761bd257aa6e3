namespace DriftWatch.Core.Statistics;

/// <summary>
/// Which points lie far off their least-squares line: |externally studentized residual| above a cut, the same
/// rule the profile counts outliers by (<see cref="Influence"/>), applied to the points a plot shows.
/// </summary>
public static class OutlyingRows
{
    /// <returns>One flag per point; all false with fewer than four points, constant x or an exact fit.</returns>
    public static bool[] Of(IReadOnlyList<double> x, IReadOnlyList<double> y, double outlierT)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        int n = x.Count;
        var flags = new bool[n];
        if (n != y.Count || n < 4)
        {
            return flags;
        }

        double mx = x.Average(), my = y.Average(), sxx = 0, sxy = 0;
        for (int i = 0; i < n; i++)
        {
            sxx += (x[i] - mx) * (x[i] - mx);
            sxy += (x[i] - mx) * (y[i] - my);
        }

        if (!(sxx > 0))
        {
            return flags;
        }

        double b = sxy / sxx, a = my - (b * mx), sse = 0, syy = 0;
        for (int i = 0; i < n; i++)
        {
            double e = y[i] - a - (b * x[i]);
            sse += e * e;
            syy += (y[i] - my) * (y[i] - my);
        }

        // Residuals that are all rounding noise: an exact line has no outliers.
        if (!(sse > 1e-20 * syy))
        {
            return flags;
        }

        // Sum of squares without row i: SSE − e²/(1 − h) (Belsley, Kuh and Welsch 1980), on n − 3 df.
        for (int i = 0; i < n; i++)
        {
            double h = (1.0 / n) + ((x[i] - mx) * (x[i] - mx) / sxx);
            double e = y[i] - a - (b * x[i]);
            if (1 - h < 1e-10)
            {
                continue;
            }

            double sseWithout = sse - (e * e / (1 - h));
            double s2 = sseWithout / (n - 3);
            if (s2 > 0)
            {
                flags[i] = Math.Abs(e) / Math.Sqrt(s2 * (1 - h)) > outlierT;
            }
            else
            {
                // Every other row lies exactly on a line: any residual of this one is infinitely far.
                flags[i] = Math.Abs(e) > 1e-12 * Math.Max(1, Math.Abs(y[i]));
            }
        }

        return flags;
    }
}
