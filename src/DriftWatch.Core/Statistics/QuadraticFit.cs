using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;
using MathNet.Numerics.Distributions;

namespace DriftWatch.Core.Statistics;

/// <summary>
/// Least squares of v on [1, z, z² − 1] with z the standardised x, solved by a thin Householder QR
/// (MathNet). Centring and scaling x first keeps the design well conditioned (x² of raw values near
/// 1e9 would lose every digit). The x² term's t-test uses SE = s/|R₃₃|: for the last column of a
/// QR the corresponding diagonal entry of (RᵀR)⁻¹ is 1/R₃₃².
/// </summary>
internal sealed record QuadraticFit(double Coefficient, double PValue, double R2Gain)
{
    /// <summary>|R₃₃| below this fraction of the column norm means x² is a combination of 1 and x.</summary>
    private const double RankTolerance = 1e-10;

    /// <param name="u">centred scaled x.</param>
    /// <param name="v">centred scaled y.</param>
    /// <returns>The coefficient of z² (in scaled y per unit z²), or null when undefined.</returns>
    public static QuadraticFit? Of(double[] u, double[] v, LineFit line, int distinctX)
    {
        ArgumentNullException.ThrowIfNull(u);
        ArgumentNullException.ThrowIfNull(v);
        ArgumentNullException.ThrowIfNull(line);
        int n = u.Length;
        if (n < 4 || distinctX < 3 || !(line.Syy > 0))
        {
            return null;
        }

        double invSd = 1 / Math.Sqrt(line.Sxx / n);
        var design = GC.AllocateUninitializedArray<double>(3 * n);
        double columnNorm2 = 0;
        for (int i = 0; i < n; i++)
        {
            double z = u[i] * invSd;
            double w = (z * z) - 1;
            design[i] = 1;
            design[n + i] = z;
            design[(2 * n) + i] = w;
            columnNorm2 += w * w;
        }

        var matrix = Matrix<double>.Build.Dense(n, 3, design);
        var qr = matrix.QR(QRMethod.Thin);
        double r33 = Math.Abs(qr.R[2, 2]);
        if (!(r33 > RankTolerance * Math.Sqrt(columnNorm2)))
        {
            return null;
        }

        var beta = qr.Solve(Vector<double>.Build.Dense(v));
        double b0 = beta[0], b1 = beta[1], b2 = beta[2];
        double sse = 0;
        for (int i = 0; i < n; i++)
        {
            int k = n + i;
            double e = v[i] - b0 - (b1 * design[k]) - (b2 * design[k + n]);
            sse += e * e;
        }

        double se = Math.Sqrt(sse / (n - 3)) / r33;
        double p;
        if (se > 0)
        {
            p = 2 * StudentT.CDF(0, 1, n - 3, -Math.Abs(b2 / se));
        }
        else
        {
            p = b2 == 0 ? 1 : 0;
        }

        double gain = Math.Max(0, (line.Sse - sse) / line.Syy);
        if (!double.IsFinite(b2) || !double.IsFinite(gain))
        {
            return null;
        }

        return new QuadraticFit(b2, Math.Clamp(double.IsNaN(p) ? 1 : p, 0, 1), gain);
    }
}
