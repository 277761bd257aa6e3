using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Profiling;

/// <summary>
/// Names the shape of a defined profile, first rule that applies wins. The order matters: an exact
/// function is perfect before anything else; a row with all the leverage (Anscombe's fourth set) is
/// reported before its consequences; outliers before a large Cook's distance, because an outlier
/// also has a large D (Anscombe's third set); curvature before "none", because a U shape has r ≈ 0.
/// </summary>
internal static class ShapeRules
{
    private const int Parameters = 2;

    public static (Shape Shape, string Reason) Classify(RelationshipProfile p, Influence influence, Thresholds t)
    {
        double r = p.PearsonR ?? 0, rho = p.SpearmanRho ?? 0;
        if (p.ExactAffine)
        {
            return (Shape.Perfect, p.ExactIdentity
                ? "y equals x on every usable row: one column is a copy of the other."
                : $"y is an exact affine function of x on every usable row: {p.Equation}.");
        }

        if (p.ExactMonotone)
        {
            string direction = rho > 0 ? "increasing" : "decreasing";
            return (Shape.Monotone, $"y is an exact {direction} but non-linear function of x (|ρ| = 1, R² = {Numbers.Sig(p.RSquared, 4)}).");
        }

        string without = p.PearsonRWithoutTopInfluence is { } rw ? $"r without it is {Numbers.Sig(rw)}" : "without it r is undefined";
        if (influence.UnitLeverageRows > 0)
        {
            return (Shape.Leverage, $"Every row but one shares the same x, so that one row alone sets the slope ({without}).");
        }

        if (IsHighLeverage(p.MaxLeverage ?? 0, p.NUsed, t))
        {
            return (Shape.Leverage, $"One row has leverage {Numbers.Sig(p.MaxLeverage)} and largely sets the slope on its own ({without}).");
        }

        if (HasOutliers(p, t))
        {
            return (Shape.Outlier, $"{Numbers.Count(p.OutlierCount ?? 0)} of {Numbers.Count(p.NUsed)} rows ({Numbers.Percent(p.OutlierRate ?? 0)}) lie more than {Numbers.Sig(t.OutlierT)} studentized residuals off the line, beyond what normal scatter explains (outlier test {Numbers.P(p.OutlierTestP)}).");
        }

        if (p.MaxCooksDistance is { } d && d > t.LeverageCooksDistance)
        {
            return (Shape.Leverage, $"One row has Cook's distance {Numbers.Sig(d)} (above {Numbers.Sig(t.LeverageCooksDistance)}): removing it moves the line substantially ({without}).");
        }

        if (IsCurved(p, t))
        {
            return (Shape.Curved, $"A quadratic term is significant ({Numbers.P(p.QuadraticP)}) and explains {Numbers.Percent(p.QuadraticR2Gain ?? 0)} more of y's variance than the line.");
        }

        if (Math.Abs(r) < t.NoRelationshipR && Math.Abs(rho) < t.NoRelationshipR)
        {
            return (Shape.None, $"|r| = {Numbers.Sig(Math.Abs(r), 2)} and |ρ| = {Numbers.Sig(Math.Abs(rho), 2)} are both below {Numbers.Sig(t.NoRelationshipR)}: no detectable relationship.");
        }

        return (Shape.Linear, $"A straight line describes the pair (r = {Numbers.Sig(r)}, R² = {Numbers.Sig(p.RSquared)}) with no curvature, outlier cluster or dominant row.");
    }

    /// <summary>
    /// More than MaxOutlierRate of the rows are outliers and the most extreme one is significant by
    /// the Bonferroni outlier test: a lone |t| of 3 in a few dozen rows is ordinary scatter
    /// (NIST's Norris data has one).
    /// </summary>
    public static bool HasOutliers(RelationshipProfile p, Thresholds t) =>
        p.OutlierRate is { } rate && rate > t.MaxOutlierRate && p.OutlierCount > 0 && p.OutlierTestP < t.Alpha;

    public static bool IsCurved(RelationshipProfile p, Thresholds t) =>
        p.QuadraticP is { } qp && qp < t.Alpha && (p.QuadraticR2Gain ?? 0) >= t.CurvatureMinR2Gain;

    /// <summary>Hat value above max(LeverageHat, 3p/n): 3p/n keeps tiny samples, where every hat value is large, from qualifying.</summary>
    public static bool IsHighLeverage(double maxLeverage, int n, Thresholds t) =>
        maxLeverage > Math.Max(t.LeverageHat, 3.0 * Parameters / n);
}
