namespace DriftWatch.Plots;

internal static class PlotFormat
{
    /// <summary>
    /// At most <paramref name="max"/> points, taken at even strides so the picture is the same on every
    /// render (no random thinning); the store already caps points per run, this guards hand-made inputs.
    /// </summary>
    public static (double[] X, double[] Y) Thin(double[] x, double[] y, int max)
    {
        if (x.Length <= max)
        {
            return (x, y);
        }

        var xs = new double[max];
        var ys = new double[max];
        for (var i = 0; i < max; i++)
        {
            var j = (int)((long)i * x.Length / max);
            xs[i] = x[j];
            ys[i] = y[j];
        }

        return (xs, ys);
    }
}
