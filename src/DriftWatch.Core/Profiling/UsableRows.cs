namespace DriftWatch.Core.Profiling;

/// <summary>
/// The finite pairs of a sample. <see cref="PairedSample.FromRows"/> already drops non-finite rows,
/// but the constructor accepts any arrays, and one NaN would poison every sum.
/// </summary>
internal readonly record struct UsableRows(double[] X, double[] Y, int DroppedNonFinite)
{
    public static UsableRows Of(PairedSample sample)
    {
        var x = sample.X;
        var y = sample.Y;
        int bad = 0;
        for (int i = 0; i < x.Length; i++)
        {
            if (!double.IsFinite(x[i]) || !double.IsFinite(y[i]))
            {
                bad++;
            }
        }

        if (bad == 0)
        {
            return new UsableRows(x, y, 0);
        }

        var fx = new double[x.Length - bad];
        var fy = new double[x.Length - bad];
        int k = 0;
        for (int i = 0; i < x.Length; i++)
        {
            if (double.IsFinite(x[i]) && double.IsFinite(y[i]))
            {
                fx[k] = x[i];
                fy[k] = y[i];
                k++;
            }
        }

        return new UsableRows(fx, fy, bad);
    }
}
