using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;

namespace DriftWatch.Core.Statistics;

/// <summary>
/// The least-squares parabola y = A + B·x + C·x² of a set of points, for drawing: fitted on the standardised x
/// z = (x − <see cref="Centre"/>) / <see cref="Scale"/> by a thin Householder QR (MathNet) and evaluated there,
/// so raw x near 1e9 keeps its digits; <see cref="A"/>, <see cref="B"/>, <see cref="C"/> are the same
/// parabola in raw x, for the equation a reader sees.
/// </summary>
public sealed record QuadraticCurve(double Centre, double Scale, double Z0, double Z1, double Z2)
{
    /// <summary>|R₃₃| below this fraction of the z² column's norm means z² is a combination of 1 and z.</summary>
    private const double RankTolerance = 1e-10;

    public double C => Z2 / (Scale * Scale);

    public double B => (Z1 / Scale) - (2 * Z2 * Centre / (Scale * Scale));

    public double A => Z0 - (Z1 * Centre / Scale) + (Z2 * Centre * Centre / (Scale * Scale));

    public double Evaluate(double x)
    {
        double z = (x - Centre) / Scale;
        return Z0 + (Z1 * z) + (Z2 * z * z);
    }

    /// <returns>Null with fewer than three distinct x values or a non-finite result.</returns>
    public static QuadraticCurve? Fit(IReadOnlyList<double> x, IReadOnlyList<double> y)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        int n = x.Count;
        if (n != y.Count || n < 3 || x.Distinct().Take(3).Count() < 3)
        {
            return null;
        }

        double centre = x.Average();
        double scale = Math.Sqrt(x.Sum(v => (v - centre) * (v - centre)) / n);
        if (!(scale > 0) || !double.IsFinite(scale))
        {
            return null;
        }

        var design = Matrix<double>.Build.Dense(n, 3, (i, j) =>
        {
            double z = (x[i] - centre) / scale;
            return j switch { 0 => 1, 1 => z, _ => z * z };
        });
        var qr = design.QR(QRMethod.Thin);
        if (!(Math.Abs(qr.R[2, 2]) > RankTolerance * design.Column(2).L2Norm()))
        {
            return null;
        }

        var beta = qr.Solve(Vector<double>.Build.Dense([.. y]));
        var curve = new QuadraticCurve(centre, scale, beta[0], beta[1], beta[2]);
        return double.IsFinite(curve.A) && double.IsFinite(curve.B) && double.IsFinite(curve.C) ? curve : null;
    }
}
