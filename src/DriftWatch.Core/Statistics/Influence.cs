namespace DriftWatch.Core.Statistics;

/// <summary>
/// Outlier and influence measures of a simple regression in O(n): the hat value of row i is
/// h = 1/n + u²/Sxx (no n × n hat matrix), externally studentized residuals (Belsley, Kuh and
/// Welsch 1980) and Cook's (1977) distance D = r²/p · h/(1 − h) with p = 2 parameters.
/// A row with h = 1 (every other x equal: Anscombe's fourth set) has a zero residual by
/// construction and undefined D and t; it is reported through <see cref="UnitLeverageRows"/>.
/// </summary>
internal sealed record Influence(
    int? OutlierCount,
    double? MaxCooksDistance,
    int? CooksOverThreshold,
    double MaxLeverage,
    int UnitLeverageRows,
    int TopInfluenceRow,
    double? MaxAbsStudentized)
{
    /// <summary>Bonferroni p of the largest |t| on n − p − 1 df (Cook and Weisberg 1982); 0 for an infinite t.</summary>
    public double? OutlierTestP(int n)
    {
        if (MaxAbsStudentized is not { } t)
        {
            return null;
        }

        if (double.IsPositiveInfinity(t))
        {
            return 0;
        }

        double p = 2 * MathNet.Numerics.Distributions.StudentT.CDF(0, 1, n - Parameters - 1, -t);
        return double.IsNaN(p) ? 1 : Math.Clamp(n * p, 0, 1);
    }

    /// <summary>1 − h below this counts as h = 1.</summary>
    private const double UnitLeverageGap = 1e-10;

    private const int Parameters = 2;

    public static Influence Of(double[] u, LineFit fit, double outlierT)
    {
        ArgumentNullException.ThrowIfNull(u);
        ArgumentNullException.ThrowIfNull(fit);
        int n = fit.Count;
        double s2 = fit.Sse / (n - Parameters);

        // A fit whose residuals are all rounding noise has no outliers and no influential rows.
        bool exactFit = !(s2 > 0);
        bool hasExternal = n > Parameters + 1;
        double cooksCut = 4.0 / n;
        double tCut2 = outlierT * outlierT;
        double invN = 1.0 / n, invSxx = 1.0 / fit.Sxx;

        int outliers = 0, cooksOver = 0, unitLeverage = 0;
        double maxD = 0, maxH = 0, maxT2 = 0;
        int topRow = -1, unitRow = -1, maxHRow = 0;
        for (int i = 0; i < n; i++)
        {
            double h = invN + (u[i] * u[i] * invSxx);
            if (h > maxH)
            {
                maxH = h;
                maxHRow = i;
            }

            double omh = 1 - h;
            if (omh < UnitLeverageGap)
            {
                unitLeverage++;
                unitRow = unitRow < 0 ? i : unitRow;
                continue;
            }

            if (exactFit)
            {
                continue;
            }

            double e = fit.Residuals[i];
            double e2 = e * e / omh;
            double r2 = e2 / s2;
            double d = r2 / Parameters * h / omh;
            bool outlier = false;
            if (hasExternal)
            {
                // s² without row i: ((n − p)s² − e²/(1 − h)) / (n − p − 1).
                double s2Deleted = (((n - Parameters) * s2) - e2) / (n - Parameters - 1);
                double t2 = s2Deleted > s2 * 1e-14 ? e2 / s2Deleted : (r2 > 1e-12 ? double.PositiveInfinity : 0);
                maxT2 = Math.Max(maxT2, t2);
                outlier = t2 > tCut2;
                outliers += outlier ? 1 : 0;
            }

            cooksOver += d > cooksCut ? 1 : 0;
            if (d > maxD || topRow < 0)
            {
                maxD = d;
                topRow = i;
            }
        }

        if (unitRow >= 0 || topRow < 0)
        {
            // A unit-leverage row outweighs any finite D; an exact fit has no D, so the row of most leverage stands in.
            topRow = unitRow >= 0 ? unitRow : maxHRow;
        }

        bool anyCooks = !exactFit && unitLeverage < n;
        return new Influence(
            OutlierCount: hasExternal ? outliers : null,
            MaxCooksDistance: anyCooks ? maxD : (exactFit ? 0 : null),
            CooksOverThreshold: exactFit ? 0 : cooksOver,
            MaxLeverage: Math.Min(maxH, 1),
            UnitLeverageRows: unitLeverage,
            TopInfluenceRow: topRow,
            MaxAbsStudentized: hasExternal && !exactFit ? Math.Sqrt(maxT2) : null);
    }
}
