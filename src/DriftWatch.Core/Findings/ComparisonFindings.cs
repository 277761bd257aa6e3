using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Findings;

/// <summary>
/// Current profile against the baseline. Each rule stands alone here (a sign flip is also a
/// correlation shift); <see cref="FindingEngine.Assess"/> removes the redundant ones.
/// </summary>
internal static class ComparisonFindings
{
    public static List<Finding> Of(
        RelationshipProfile cur, PairedSample curSample, RelationshipProfile bas, PairedSample basSample, PairExpectation expect, Thresholds t, ColumnNames c)
    {
        var findings = new List<Finding>();
        bool bothDefined = cur.Shape != Shape.Undefined && bas.Shape != Shape.Undefined;
        if (bothDefined)
        {
            BecamePerfect(cur, bas, expect, c, findings);
            Correlations(cur, bas, t, c, findings);
            SlopeAndOffset(cur, bas, t, c, findings);
            ShapeChanges(cur, bas, t, c, findings);
        }

        Rows(cur, bas, t, c, findings);
        Marginals(cur, curSample, bas, basSample, t, c, findings);
        return findings;
    }

    private static void BecamePerfect(RelationshipProfile cur, RelationshipProfile bas, PairExpectation expect, ColumnNames c, List<Finding> findings)
    {
        bool nowExact = cur.ExactAffine || cur.ExactMonotone;
        bool wasExact = bas.ExactAffine || bas.ExactMonotone;
        if (expect.Exact || !nowExact || wasExact)
        {
            return;
        }

        string what = cur.ExactIdentity
            ? $"an exact copy of {c.X}"
            : cur.ExactAffine ? $"an exact function of {c.X} ({c.Equation(cur.Equation)})" : $"an exact monotone function of {c.X}";
        findings.Add(new Finding(
            FindingKind.BecamePerfect,
            Severity.Critical,
            null,
            cur.ExactAffine ? cur.PearsonR : cur.SpearmanRho,
            $"{c.Y} became {what}; in the baseline it was an independent measurement (r = {Numbers.Sig(bas.PearsonR)}): look for a job or view that now copies or derives {c.Y} from {c.X}."));
    }

    private static void Correlations(RelationshipProfile cur, RelationshipProfile bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        if (cur.PearsonR is not { } r1 || bas.PearsonR is not { } r0)
        {
            return;
        }

        double? p = Statistics.Correlation.FisherTwoSampleP(r1, cur.NUsed, r0, bas.NUsed);
        if (p is not { } pz || !(pz < t.Alpha))
        {
            return;
        }

        double delta = r1 - r0;
        string change = $"r moved from {Numbers.Sig(r0)} to {Numbers.Sig(r1)} (Fisher z, {Numbers.P(pz)})";
        if (r1 * r0 < 0 && Math.Abs(r1) >= t.NoRelationshipR && Math.Abs(r0) >= t.NoRelationshipR
            && cur.PearsonP < t.Alpha && bas.PearsonP < t.Alpha)
        {
            findings.Add(new Finding(
                FindingKind.SignFlip,
                Severity.Critical,
                pz,
                delta,
                $"The relationship of {c.Y} with {c.X} reversed direction: {change}; look for a sign convention, swapped column or inverted scale."));
        }

        double rho1 = cur.SpearmanRho ?? 0;
        if (Math.Abs(r0) >= t.StrongRelationshipR && Math.Abs(r1) < t.NoRelationshipR && Math.Abs(rho1) < t.NoRelationshipR)
        {
            findings.Add(new Finding(
                FindingKind.RelationshipLost,
                Severity.Critical,
                pz,
                delta,
                $"{c.Y} no longer follows {c.X}: {change}, and ρ = {Numbers.Sig(rho1)}; look for a broken join, a shuffled key or a column that stopped being filled."));
        }

        if (Math.Abs(delta) >= t.MinCorrelationChange)
        {
            findings.Add(new Finding(
                FindingKind.CorrelationShift,
                Severity.Warning,
                pz,
                delta,
                $"The correlation of {c.Y} with {c.X} {(delta > 0 ? "strengthened" : "weakened")}: {change}."));
        }
    }

    private static void SlopeAndOffset(RelationshipProfile cur, RelationshipProfile bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        if (cur.Slope is not { } b1 || bas.Slope is not { } b0 || cur.SlopeSe is not { } se1 || bas.SlopeSe is not { } se0)
        {
            return;
        }

        double pSlope = ZTest.TwoSidedP((b1 - b0) / Math.Sqrt((se1 * se1) + (se0 * se0)));
        double ratio = b1 / b0;
        if (pSlope < t.Alpha && ratio > 0 && double.IsFinite(ratio) && Math.Abs(ratio - 1) >= t.MinSlopeRatioChange)
        {
            string moved = $"The slope of {c.Y} on {c.X} changed by a factor of {Numbers.Sig(ratio, 4)} ({Numbers.Sig(b0, 4)} to {Numbers.Sig(b1, 4)}, {Numbers.P(pSlope)}) while r went from {Numbers.Sig(bas.PearsonR)} to {Numbers.Sig(cur.PearsonR)}";
            var unit = UnitFactors.Match(ratio, t.UnitFactorTolerance);
            findings.Add(unit is { } u
                ? new Finding(FindingKind.SlopeShift, Severity.Critical, pSlope, ratio,
                    $"{moved}: the factor is close to {u.Factor} ({u.Description}), and a unit change keeps r and moves the slope; check whether {c.Y} or {c.X} changed units.")
                : new Finding(FindingKind.SlopeShift, Severity.Warning, pSlope, ratio,
                    $"{moved}: the same change in {c.X} now moves {c.Y} by a different amount; check for a changed formula, rate or unit."));
        }

        Offset(cur, bas, t, c, findings);
    }

    /// <summary>
    /// The current line's value at the baseline's mean x against the baseline's mean y (where the
    /// baseline line passes), so the test does not depend on where x = 0 lies.
    /// </summary>
    private static void Offset(RelationshipProfile cur, RelationshipProfile bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        if (cur.Intercept is not { } a1 || cur.Slope is not { } b1 || cur.ResidualSd is not { } s1 || cur.XMean is not { } x1 || cur.XSd is not { } sdx1
            || bas.XMean is not { } x0 || bas.YMean is not { } y0 || bas.ResidualSd is not { } s0 || bas.YSd is not { } sdy0)
        {
            return;
        }

        double delta = a1 + (b1 * x0) - y0;
        double sxx1 = (cur.NUsed - 1) * sdx1 * sdx1;
        double dx = x0 - x1;
        double se = Math.Sqrt((s1 * s1 * ((1.0 / cur.NUsed) + (dx * dx / sxx1))) + (s0 * s0 / bas.NUsed));
        double unit = s0 > 0 ? s0 : t.ExactRelativeTolerance * sdy0;
        double p = ZTest.TwoSidedP(delta / se);
        if (!(unit > 0) || !(p < t.Alpha) || !(Math.Abs(delta) >= t.MinOffsetShiftSds * unit))
        {
            return;
        }

        findings.Add(new Finding(
            FindingKind.OffsetShift,
            Severity.Warning,
            p,
            delta / unit,
            $"At the same {c.X}, {c.Y} is now {Numbers.Sig(Math.Abs(delta), 4)} {(delta > 0 ? "higher" : "lower")} than in the baseline ({Numbers.Sig(Math.Abs(delta / unit))} baseline residual SDs, {Numbers.P(p)}): look for a changed offset, default value or baseline in {c.Y}."));
    }

    private static void ShapeChanges(RelationshipProfile cur, RelationshipProfile bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        bool exact = cur.ExactAffine || cur.ExactMonotone || bas.ExactAffine || bas.ExactMonotone;
        if (!exact && ShapeRules.IsCurved(cur, t) && !ShapeRules.IsCurved(bas, t))
        {
            findings.Add(new Finding(
                FindingKind.CurvatureAppeared,
                Severity.Warning,
                cur.QuadraticP,
                (cur.QuadraticR2Gain ?? 0) - (bas.QuadraticR2Gain ?? 0),
                $"{c.Y} now bends away from a straight line in {c.X} (quadratic term {Numbers.P(cur.QuadraticP)}, {Numbers.Percent(cur.QuadraticR2Gain ?? 0)} more variance explained), which it did not in the baseline: look for a capped, saturated or re-derived value."));
        }

        if (cur.OutlierCount is { } k1 && bas.OutlierCount is { } k0 && cur.OutlierRate is { } rate1 && bas.OutlierRate is { } rate0
            && rate1 - rate0 >= t.MinOutlierRateIncrease)
        {
            double p = ZTest.ProportionIncreaseP(k1, cur.NUsed, k0, bas.NUsed);
            if (p < t.Alpha)
            {
                findings.Add(new Finding(
                    FindingKind.OutlierSurge,
                    Severity.Warning,
                    p,
                    rate1 - rate0,
                    $"Rows far off the line of {c.Y} on {c.X} rose from {Numbers.Percent(rate0)} to {Numbers.Percent(rate1)} ({Numbers.Count(k1)} rows, {Numbers.P(p)}): check the new rows for unit, entry or join errors."));
            }
        }

        if (ProfileFindings.IsLeverage(cur, t) && !ProfileFindings.IsLeverage(bas, t))
        {
            string without = cur.PearsonRWithoutTopInfluence is { } rw ? $"r would be {Numbers.Sig(rw)} without it" : "r is undefined without it";
            findings.Add(new Finding(
                FindingKind.LeverageAppeared,
                Severity.Warning,
                null,
                cur.MaxCooksDistance is { } d && cur.MaxLeverage < 1 ? d : cur.MaxLeverage,
                $"A single row now sets the slope of {c.Y} on {c.X} (leverage {Numbers.Sig(cur.MaxLeverage)}; {without}), which no row did in the baseline: check that row."));
        }
    }

    private static void Rows(RelationshipProfile cur, RelationshipProfile bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        if (cur.NRows > 0 && bas.NRows > 0)
        {
            long dropped1 = cur.NRows - cur.NUsed, dropped0 = bas.NRows - bas.NUsed;
            double rate1 = (double)dropped1 / cur.NRows, rate0 = (double)dropped0 / bas.NRows;
            double p = ZTest.ProportionIncreaseP(dropped1, cur.NRows, dropped0, bas.NRows);
            if (rate1 - rate0 >= t.MinNullRateIncrease && p < t.Alpha)
            {
                findings.Add(new Finding(
                    FindingKind.NullSurge,
                    Severity.Warning,
                    p,
                    rate1 - rate0,
                    $"Rows without a usable {c.X} or {c.Y} rose from {Numbers.Percent(rate0)} to {Numbers.Percent(rate1)} ({Numbers.Count(cur.NNull)} null, {Numbers.Count(cur.NNonfinite)} non-finite, {Numbers.Count(cur.NNonNumeric)} non-numeric; {Numbers.P(p)}): check the load or join that fills them."));
            }
        }

        if (bas.NUsed > 0 && cur.NUsed < t.SampleShrinkRatio * bas.NUsed)
        {
            double ratio = (double)cur.NUsed / bas.NUsed;
            findings.Add(new Finding(
                FindingKind.SampleShrank,
                Severity.Warning,
                null,
                ratio,
                $"Only {Numbers.Count(cur.NUsed)} usable rows against {Numbers.Count(bas.NUsed)} in the baseline ({Numbers.Percent(ratio)}): the window or filter may be missing data, and every comparison has less power."));
        }
    }

    private static void Marginals(
        RelationshipProfile cur, PairedSample curSample, RelationshipProfile bas, PairedSample basSample, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        var now = UsableRows.Of(curSample);
        var then = UsableRows.Of(basSample);
        Marginal(now.X, then.X, c.X, cur.XMean, cur.XSd, bas.XMean, bas.XSd, t, findings);
        Marginal(now.Y, then.Y, c.Y, cur.YMean, cur.YSd, bas.YMean, bas.YSd, t, findings);
    }

    private static void Marginal(
        double[] now, double[] then, string column, double? mean1, double? sd1, double? mean0, double? sd0, Thresholds t, List<Finding> findings)
    {
        if (KolmogorovSmirnov.TwoSample(now, then) is not { } ks || !(ks.P < t.Alpha) || ks.D < t.MinKsStatistic)
        {
            return;
        }

        findings.Add(new Finding(
            FindingKind.MarginalShift,
            Severity.Info,
            ks.P,
            ks.D,
            $"The distribution of {column} shifted (Kolmogorov–Smirnov D = {Numbers.Sig(ks.D, 2)}, {Numbers.P(ks.P)}; mean {Numbers.Sig(mean0, 4)} to {Numbers.Sig(mean1, 4)}, SD {Numbers.Sig(sd0, 3)} to {Numbers.Sig(sd1, 3)}): the population sampled may have changed even where the relationship holds."));
    }
}
