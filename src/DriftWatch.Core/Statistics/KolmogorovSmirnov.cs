namespace DriftWatch.Core.Statistics;

/// <summary>
/// Two-sample Kolmogorov–Smirnov test (Kolmogorov 1933, Smirnov 1948) with the asymptotic p-value
/// and Stephens' (1970) small-sample correction of λ. MathNet.Numerics 5 offers no two-sample KS
/// test, hence this file.
/// </summary>
internal static class KolmogorovSmirnov
{
    /// <returns>D = sup |F1 − F2| and its asymptotic p, or null when a sample is empty. Values must be finite.</returns>
    public static (double D, double P)? TwoSample(double[] a, double[] b)
    {
        ArgumentNullException.ThrowIfNull(a);
        ArgumentNullException.ThrowIfNull(b);
        if (a.Length == 0 || b.Length == 0)
        {
            return null;
        }

        // Sorted order-preserving keys: equal keys are equal values, so the statistic needs nothing else.
        var x = RadixSort.SortKeys(a);
        var y = RadixSort.SortKeys(b);
        double d = Statistic(x, y);
        double ne = (double)x.Length * y.Length / (x.Length + y.Length);
        double sqrtNe = Math.Sqrt(ne);
        double lambda = (sqrtNe + 0.12 + (0.11 / sqrtNe)) * d;
        return (d, Survival(lambda));
    }

    /// <summary>sup |F1 − F2| over sorted keys (<see cref="RadixSort.Key"/>); tied values advance both sides before comparing.</summary>
    internal static double Statistic(ulong[] sortedA, ulong[] sortedB)
    {
        int n1 = sortedA.Length, n2 = sortedB.Length;
        int i = 0, j = 0;
        double d = 0;
        while (i < n1 && j < n2)
        {
            ulong v = Math.Min(sortedA[i], sortedB[j]);
            while (i < n1 && sortedA[i] == v)
            {
                i++;
            }

            while (j < n2 && sortedB[j] == v)
            {
                j++;
            }

            d = Math.Max(d, Math.Abs(((double)i / n1) - ((double)j / n2)));
        }

        return d;
    }

    /// <summary>Q_KS(λ) = 2 Σ_{k≥1} (−1)^{k−1} exp(−2k²λ²), the Kolmogorov distribution's upper tail.</summary>
    internal static double Survival(double lambda)
    {
        if (lambda < 0.2)
        {
            // The series converges slowly here and its value is 1 to double precision.
            return 1;
        }

        double sum = 0;
        double sign = 1;
        double minus2L2 = -2 * lambda * lambda;
        for (int k = 1; k <= 100; k++)
        {
            double term = sign * Math.Exp(minus2L2 * k * k);
            sum += term;
            if (Math.Abs(term) < 1e-16 * Math.Abs(sum))
            {
                break;
            }

            sign = -sign;
        }

        return Math.Clamp(2 * sum, 0, 1);
    }
}
