using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Findings;

/// <summary>
/// What one profile says on its own. Outliers, curvature and a dominant row are properties of a pair, reported
/// as info (the change kinds against the baseline are what alert); an exact function is the data smell the tool
/// exists for, a warning until the baseline shows it was always so. What the owner declares (exactness, direction)
/// is checked on every run.
/// </summary>
internal static class ProfileFindings
{
    /// <param name="baselineExact">The pair's baseline was already an exact function: a known state, reported as info.</param>
    public static List<Finding> Of(RelationshipProfile p, PairDeclaration declared, Thresholds t, ColumnNames c, bool baselineExact = false)
    {
        var findings = new List<Finding>();
        if (p.Shape == Shape.Undefined)
        {
            return findings;
        }

        bool exact = p.ExactAffine || p.ExactMonotone;
        if (declared.Exact && !exact)
        {
            findings.Add(new Finding(
                FindingKind.ExactnessLost,
                Severity.Critical,
                null,
                1 - (p.RSquared ?? 0),
                $"{c.Y} is no longer an exact function of {c.X} as declared (R² = {Numbers.Sig(p.RSquared, 6)}, residual SD {Numbers.Sig(p.ResidualSd)}): check the job or formula that derives {c.Y} from {c.X}."));
        }
        else if (!declared.Exact && exact)
        {
            findings.Add(Perfect(p, c, baselineExact ? Severity.Info : Severity.Warning));
        }

        if (Direction(p, declared, t, c) is { } direction)
        {
            findings.Add(direction);
        }

        if (!exact && ShapeRules.IsCurved(p, t))
        {
            findings.Add(new Finding(
                FindingKind.Curvature,
                Severity.Info,
                p.QuadraticP,
                p.QuadraticR2Gain,
                $"{c.Y} bends away from a straight line in {c.X} (quadratic term {Numbers.P(p.QuadraticP)}, {Numbers.Percent(p.QuadraticR2Gain ?? 0)} more variance explained): r and the slope misdescribe a curved relationship."));
        }

        if (ShapeRules.HasOutliers(p, t) && p.OutlierRate is { } rate)
        {
            findings.Add(new Finding(
                FindingKind.Outliers,
                Severity.Info,
                p.OutlierTestP,
                rate,
                $"{Numbers.Count(p.OutlierCount ?? 0)} of {Numbers.Count(p.NUsed)} rows ({Numbers.Percent(rate)}) lie more than {Numbers.Sig(t.OutlierT)} studentized residuals off the line of {c.Y} on {c.X} (more than {Numbers.Percent(t.MaxOutlierRate)}): check them for unit, entry or join errors."));
        }

        if (IsLeverage(p, t))
        {
            string without = p.PearsonRWithoutTopInfluence is { } rw
                ? $"without it r would be {Numbers.Sig(rw)} instead of {Numbers.Sig(p.PearsonR)}"
                : $"without it r is undefined (r = {Numbers.Sig(p.PearsonR)} rests on that row alone)";
            findings.Add(new Finding(
                FindingKind.SinglePointLeverage,
                Severity.Info,
                null,
                p.MaxCooksDistance is { } d && p.MaxLeverage < 1 ? d : p.MaxLeverage,
                $"A single row sets the slope of {c.Y} on {c.X} (leverage {Numbers.Sig(p.MaxLeverage)}); {without}: check that row before trusting the line."));
        }

        return findings;
    }

    /// <summary>The profile on its own shows a row that dominates the fit.</summary>
    public static bool IsLeverage(RelationshipProfile p, Thresholds t) =>
        p.Shape == Shape.Leverage || (!p.ExactAffine && ShapeRules.IsHighLeverage(p.MaxLeverage ?? 0, p.NUsed, t));

    private static Finding Perfect(RelationshipProfile p, ColumnNames c, Severity severity)
    {
        const string Advice = "a duplicated or derived column, not an independent measurement; if that is by design, declare the pair exact";
        string message = p.ExactIdentity
            ? $"{c.Y} equals {c.X} on every sampled row: {Advice}."
            : p.ExactAffine
                ? $"{c.Y} is an exact affine function of {c.X} ({c.Equation(p.Equation)}) on every sampled row: {Advice}."
                : $"{c.Y} is an exact monotone function of {c.X} (|ρ| = 1, not a straight line) on every sampled row: {Advice}.";
        return new Finding(FindingKind.PerfectRelationship, severity, null, p.ExactAffine ? p.PearsonR : p.SpearmanRho, message);
    }

    private static Finding? Direction(RelationshipProfile p, PairDeclaration declared, Thresholds t, ColumnNames c)
    {
        if (declared.Direction == DeclaredDirection.Any || p.PearsonR is not { } r || !(p.PearsonP < t.Alpha))
        {
            return null;
        }

        bool wrong = declared.Direction == DeclaredDirection.Positive ? r < 0 : r > 0;
        if (!wrong)
        {
            return null;
        }

        string actual = r < 0 ? "falls" : "rises";
        string claimed = declared.Direction == DeclaredDirection.Positive ? "positive" : "negative";
        return new Finding(
            FindingKind.SignFlip,
            Severity.Critical,
            p.PearsonP,
            r,
            $"{c.Y} {actual} as {c.X} rises (r = {Numbers.Sig(r)}, {Numbers.P(p.PearsonP)}), but the pair is declared {claimed}: look for a sign, direction or column swap upstream.");
    }
}
