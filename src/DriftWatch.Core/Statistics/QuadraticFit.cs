using MathNet.Numerics.Distributions;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;

namespace DriftWatch.Core.Statistics;

/// <summary>
/// Least squares of v on [1, z, z² − 1] with z the standardised x, by Householder QR (MathNet).
/// Centring and scaling x first keeps the design well conditioned (x² of raw values near 1e9 would
/// lose every digit). The QR runs over blocks of rows ("tall-skinny" QR): each step factors the
/// previous 4 × 4 triangle stacked on the next block of [1, z, w, v], so the final triangle R holds
/// everything: R's first three columns are the design's R factor, its last column is Qᵀv, and
/// |R₄₄|² is the residual sum of squares. Blocks keep every matrix below the large-object heap
/// (a million-row design and MathNet's copy of it were 48 MB per profile and forced full GCs).
/// The x² term's t-test uses SE = s/|R₃₃|: for the last design column the diagonal entry of
/// (RᵀR)⁻¹ is 1/R₃₃².
/// </summary>
internal sealed record QuadraticFit(double Coefficient, double PValue, double R2Gain)
{
    /// <summary>|R₃₃| below this fraction of the column norm means x² is a combination of 1 and x.</summary>
    private const double RankTolerance = 1e-10;

    /// <summary>Rows per block: (BlockRows + 4) × 4 doubles stay under the 85,000-byte large-object threshold.</summary>
    private const int BlockRows = 2048;

    private const int Columns = 4;

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
        double columnNorm2 = 0;
        Matrix<double>? r = null;
        for (int lo = 0; lo < n; lo += BlockRows)
        {
            int rows = Math.Min(BlockRows, n - lo);
            int carried = r is null ? 0 : Columns;
            int height = carried + rows;

            // Column-major (MathNet's dense storage): the carried triangle on top, then the block.
            var block = new double[height * Columns];
            for (int c = 0; c < carried; c++)
            {
                for (int k = 0; k <= c; k++)
                {
                    block[(c * height) + k] = r![k, c];
                }
            }

            for (int i = 0; i < rows; i++)
            {
                double z = u[lo + i] * invSd;
                double w = (z * z) - 1;
                int at = carried + i;
                block[at] = 1;
                block[height + at] = z;
                block[(2 * height) + at] = w;
                block[(3 * height) + at] = v[lo + i];
                columnNorm2 += w * w;
            }

            r = Matrix<double>.Build.Dense(height, Columns, block).QR(QRMethod.Thin).R;
        }

        double r33 = Math.Abs(r![2, 2]);
        if (!(r33 > RankTolerance * Math.Sqrt(columnNorm2)))
        {
            return null;
        }

        // Back substitution for the x² coefficient only: it is the last unknown.
        double b2 = r[2, 3] / r[2, 2];
        double sse = r[3, 3] * r[3, 3];
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
