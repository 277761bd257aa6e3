using MathNet.Numerics.Distributions;

namespace DriftWatch.Core.Statistics;

/// <summary>Pearson's r from centred sums, its t-test and Fisher's z interval and two-sample test.</summary>
internal static class Correlation
{
    /// <summary>z of the standard normal that leaves 2.5 % in each tail (95 % interval).</summary>
    private const double Z975 = 1.959963984540054;

    /// <summary>Largest |r| fed to atanh: keeps Fisher's z finite for a perfect correlation.</summary>
    private const double MaxAbsRForZ = 1 - 1e-15;

    public static double? Pearson(double sxx, double syy, double sxy)
    {
        if (!(sxx > 0) || !(syy > 0))
        {
            return null;
        }

        double r = sxy / (Math.Sqrt(sxx) * Math.Sqrt(syy));
        return double.IsFinite(r) ? Math.Clamp(r, -1.0, 1.0) : null;
    }

    /// <summary>Two-sided p of H0: ρ = 0 by t = r √((n − 2)/(1 − r²)) on n − 2 df (common practice).</summary>
    public static double? PValue(double r, int n)
    {
        if (n < 3)
        {
            return null;
        }

        double oneMinus = 1 - (r * r);
        if (oneMinus <= 0)
        {
            return 0;
        }

        double t = Math.Abs(r) * Math.Sqrt((n - 2) / oneMinus);
        return Clamp01(2 * StudentT.CDF(0, 1, n - 2, -t));
    }

    /// <summary>95 % interval by Fisher's (1915, 1921) z = atanh r with SE 1/√(n − 3).</summary>
    public static (double Low, double High)? FisherInterval(double r, int n)
    {
        if (n <= 3)
        {
            return null;
        }

        if (Math.Abs(r) >= 1)
        {
            return (r, r);
        }

        double z = Math.Atanh(r);
        double half = Z975 / Math.Sqrt(n - 3);
        return (Math.Tanh(z - half), Math.Tanh(z + half));
    }

    /// <summary>Fisher's z = atanh r, with |r| held just below 1 so a perfect correlation stays finite.</summary>
    public static double FisherZ(double r) => Math.Atanh(Math.Clamp(r, -MaxAbsRForZ, MaxAbsRForZ));

    /// <summary>Two-sided p of H0: ρ1 = ρ2 for independent samples, by Fisher's z (common practice).</summary>
    public static double? FisherTwoSampleP(double r1, int n1, double r2, int n2)
    {
        if (n1 <= 3 || n2 <= 3)
        {
            return null;
        }

        double z1 = FisherZ(r1);
        double z2 = FisherZ(r2);
        double se = Math.Sqrt((1.0 / (n1 - 3)) + (1.0 / (n2 - 3)));
        return ZTest.TwoSidedP((z1 - z2) / se);
    }

    private static double Clamp01(double p) => double.IsNaN(p) ? 1 : Math.Clamp(p, 0, 1);
}
