using MathNet.Numerics.Distributions;

namespace DriftWatch.Core.Statistics;

/// <summary>Normal-approximation tests: p-values of a z statistic and the two-proportion test.</summary>
internal static class ZTest
{
    public static double TwoSidedP(double z)
    {
        if (double.IsNaN(z))
        {
            return 1;
        }

        return Math.Clamp(2 * Normal.CDF(0, 1, -Math.Abs(z)), 0, 1);
    }

    /// <summary>P(Z ≥ z).</summary>
    public static double UpperP(double z) => double.IsNaN(z) ? 1 : Math.Clamp(Normal.CDF(0, 1, -z), 0, 1);

    /// <summary>
    /// One-sided p of H0: p1 ≤ p2 against p1 &gt; p2 (the current rate rose), with the pooled-variance
    /// two-proportion z statistic (common practice).
    /// </summary>
    public static double ProportionIncreaseP(long k1, long n1, long k2, long n2)
    {
        if (n1 <= 0 || n2 <= 0)
        {
            return 1;
        }

        double p1 = (double)k1 / n1;
        double p2 = (double)k2 / n2;
        double pooled = (double)(k1 + k2) / (n1 + n2);
        double se = Math.Sqrt(pooled * (1 - pooled) * ((1.0 / n1) + (1.0 / n2)));
        if (se == 0)
        {
            return p1 > p2 ? 0 : 1;
        }

        return UpperP((p1 - p2) / se);
    }
}
