using DriftWatch.Core.Baselines;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Findings;

/// <summary>
/// The current run against the normal range of the baseline's runs. Every figure is tested against the spread
/// the baseline's own runs showed plus the current run's sampling error (<see cref="RunSpread"/>), and must also
/// move by a minimum effect, so ordinary day-to-day variation and huge samples do not alert. Properties the
/// baseline already had (outliers, curvature, a dominant row, exactness) are not news; changes are. Each rule
/// stands alone here (a sign flip is also a correlation shift); <see cref="FindingEngine.Assess"/> removes the
/// redundant ones.
/// </summary>
internal static class ComparisonFindings
{
    /// <param name="withMarginals">Run the Kolmogorov–Smirnov tests of x and y (info only); the relaxed confirmation pass leaves them out.</param>
    public static List<Finding> Of(
        RelationshipProfile cur, RunFigures now, PairedSample curSample, BaselineView bas, PairDeclaration declared, Thresholds t, ColumnNames c, bool withMarginals = true)
    {
        var findings = new List<Finding>();
        bool bothDefined = cur.Shape != Shape.Undefined && bas.Pooled.Shape != Shape.Undefined;
        if (bothDefined)
        {
            BecamePerfect(cur, bas, declared, c, findings);
            PartlyDerived(cur, bas, declared, t, c, findings);
            if (!bas.Mostly(r => r.IsExactFunction) && !(cur.ExactAffine || cur.ExactMonotone))
            {
                Correlations(cur, now, bas, t, c, findings);
                SlopeAndOffset(now, bas, t, c, findings);
                ShapeChanges(cur, now, bas, t, c, findings);
            }
        }

        Rows(cur, now, bas, t, c, findings);
        if (withMarginals)
        {
            Marginals(cur, curSample, bas.Pooled, bas.Points, t, c, findings);
        }

        return findings;
    }

    private static void BecamePerfect(RelationshipProfile cur, BaselineView bas, PairDeclaration declared, ColumnNames c, List<Finding> findings)
    {
        bool nowExact = cur.ExactAffine || cur.ExactMonotone;
        bool wasExact = bas.Mostly(r => r.IsExactFunction) || bas.Pooled.ExactAffine || bas.Pooled.ExactMonotone;
        if (declared.Exact || !nowExact || wasExact)
        {
            return;
        }

        string what = cur.ExactIdentity
            ? $"an exact copy of {c.X}"
            : cur.ExactAffine ? $"an exact function of {c.X} ({c.Equation(cur.Equation)})" : $"an exact monotone function of {c.X}";
        double? r0 = bas.Mean(r => r.R);
        findings.Add(new Finding(
            FindingKind.BecamePerfect,
            Severity.Critical,
            null,
            cur.ExactAffine ? cur.PearsonR : cur.SpearmanRho,
            $"{c.Y} became {what}; in the baseline it was not an exact function of {c.X} (r = {Numbers.Sig(r0, 4)}): look for a job or view that now copies or derives {c.Y} from {c.X}."));
    }

    /// <summary>
    /// A share of rows now lies exactly on one line, which the baseline's runs did not show: part of the rows is
    /// copied or derived from the other column. Critical, like <see cref="FindingKind.BecamePerfect"/>.
    /// </summary>
    private static void PartlyDerived(RelationshipProfile cur, BaselineView bas, PairDeclaration declared, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        if (declared.Exact || cur.ExactAffine || cur.ExactMonotone || cur.DerivedShare is not { } share)
        {
            return;
        }

        double before = bas.Mean(r => r.DerivedShare) ?? bas.Pooled.DerivedShare ?? 0;
        if (share < t.MinDerivedShare || share - before < t.MinDerivedShare)
        {
            return;
        }

        findings.Add(new Finding(
            FindingKind.PartlyDerived,
            Severity.Critical,
            null,
            share,
            $"{Numbers.Percent(share)} of the sampled rows now lie exactly on one line, {c.Equation(cur.DerivedEquation)}, against {Numbers.Percent(before)} in the baseline runs: on those rows {c.Y} is copied or derived from {c.X}; look for a job, source system or default that fills {c.Y} from {c.X}."));
    }

    /// <summary>
    /// r depends on how widely x is spread: a quiet day with a narrower range of x has a lower r for the very same
    /// relationship (range restriction). So r is compared twice: as it is, and against the r the baseline's line
    /// and scatter would give at today's spread of x, ρ(s) = b·s/√(b²s² + σ²) (the classic correction for range
    /// restriction; common practice in psychometrics). A finding needs both: a narrower range alone changes only
    /// the first, a unit change of x only the second.
    /// </summary>
    private static void Correlations(RelationshipProfile cur, RunFigures now, BaselineView bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        if (now.R is not { } r1 || bas.Mean(r => r.R) is not { } r0 || now.Used <= 3)
        {
            return;
        }

        double currentVar = 1.0 / (now.Used - 3);
        var plain = RunSpread.Of(bas.Runs.Where(r => r.R is not null && r.Used > 3).Select(r => (Correlation.FisherZ(r.R!.Value), 1.0 / (r.Used - 3))), currentVar);
        if (plain is not { } zPlain)
        {
            return;
        }

        double pPlain = zPlain.TwoSidedP(Correlation.FisherZ(r1));
        double expected = r0;
        double pAdjusted = pPlain;
        if (bas.Mean(r => r.Slope) is { } b && bas.Mean(r => r.ResidualSd) is { } sigma && sigma > 0 && now.XSd is { } sx1)
        {
            var adjusted = RunSpread.Of(
                bas.Runs.Where(r => r.R is not null && r.XSd is not null && r.Used > 3)
                    .Select(r => (Correlation.FisherZ(r.R!.Value) - Correlation.FisherZ(RangeR(b, sigma, r.XSd!.Value)), 1.0 / (r.Used - 3))),
                currentVar);
            if (adjusted is { } zAdjusted)
            {
                double expectedZ = Correlation.FisherZ(RangeR(b, sigma, sx1)) + zAdjusted.Centre;
                expected = Math.Tanh(expectedZ);
                pAdjusted = zAdjusted.TwoSidedP(Correlation.FisherZ(r1) - Correlation.FisherZ(RangeR(b, sigma, sx1)));
            }
        }

        double p = Math.Max(pPlain, pAdjusted);
        if (!(p < t.Alpha))
        {
            return;
        }

        double delta = r1 - expected;
        string expectedText = Math.Abs(expected - r0) >= 0.01 ? $" ({Numbers.Sig(expected)} expected at this run's spread of {c.X})" : string.Empty;
        string change = $"r moved from {Numbers.Sig(r0)}{expectedText} to {Numbers.Sig(r1)} (beyond the baseline runs' range, {Numbers.P(p)})";
        if (r1 * r0 < 0 && Math.Abs(r1) >= t.NoRelationshipR && Math.Abs(r0) >= t.NoRelationshipR && cur.PearsonP < t.Alpha)
        {
            findings.Add(new Finding(
                FindingKind.SignFlip,
                Severity.Critical,
                p,
                r1 - r0,
                $"The relationship of {c.Y} with {c.X} reversed direction: {change}; look for a sign convention, swapped column or inverted scale."));
        }

        double rho1 = cur.SpearmanRho ?? 0;
        if (Math.Abs(r0) >= t.StrongRelationshipR && Math.Abs(r1) < t.NoRelationshipR && Math.Abs(rho1) < t.NoRelationshipR)
        {
            findings.Add(new Finding(
                FindingKind.RelationshipLost,
                Severity.Critical,
                p,
                r1 - r0,
                $"{c.Y} no longer follows {c.X}: {change}, and ρ = {Numbers.Sig(rho1)}; look for a broken join, a shuffled key or a column that stopped being filled."));
        }

        if (Math.Abs(delta) >= t.MinCorrelationChange && Math.Abs(r1 - r0) >= t.MinCorrelationChange)
        {
            // Strength is |r|: −0.738 to −0.616 is a weaker relationship, not a stronger one.
            string direction = Math.Abs(r1) > Math.Abs(expected) ? "strengthened" : "weakened";
            findings.Add(new Finding(
                FindingKind.CorrelationShift,
                Severity.Warning,
                p,
                delta,
                $"The correlation of {c.Y} with {c.X} {direction}: {change}."));
        }
    }

    private static void SlopeAndOffset(RunFigures now, BaselineView bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        // A slope means little where there was no relationship to begin with.
        if (now.Slope is not { } b1 || now.SlopeVariance is not { } v1 || bas.Mean(r => r.R) is not { } r0 || Math.Abs(r0) < t.NoRelationshipR)
        {
            return;
        }

        var slope = RunSpread.Of(bas.Runs.Where(r => r.Slope is not null && r.SlopeVariance is not null).Select(r => (r.Slope!.Value, r.SlopeVariance!.Value)), v1);
        if (slope is { } s && s.Centre != 0)
        {
            double b0 = s.Centre;
            double p = s.TwoSidedP(b1);
            double ratio = b1 / b0;
            if (p < t.Alpha && ratio > 0 && double.IsFinite(ratio) && Math.Abs(ratio - 1) >= t.MinSlopeRatioChange)
            {
                string moved = $"The slope of {c.Y} on {c.X} changed by a factor of {Numbers.Sig(ratio, 4)} ({Numbers.Sig(b0, 4)} to {Numbers.Sig(b1, 4)}, beyond the baseline runs' range, {Numbers.P(p)}) while r went from {Numbers.Sig(r0)} to {Numbers.Sig(now.R)}";

                // The ratio's own uncertainty (the baseline's spread and this run's sampling error) decides which
                // factors it is compatible with, never tighter than the configured tolerance.
                double relativeHalfWidth = Math.Clamp(s.HalfWidth(t.Alpha) / Math.Abs(b0), t.UnitFactorTolerance, Math.Max(t.UnitFactorTolerance, t.UnitFactorMaxTolerance));
                bool rKept = now.R is { } r1 && Math.Abs(r1 - r0) < t.MinCorrelationChange;
                var unit = rKept ? UnitFactors.Match(ratio, relativeHalfWidth) : null;
                findings.Add(unit is { } u
                    ? new Finding(FindingKind.SlopeShift, Severity.Critical, p, ratio,
                        $"{moved}: the factor is close to {u.Factor} ({u.Description}), and a unit change keeps r and moves the slope; check whether {c.Y} or {c.X} changed units.")
                    : new Finding(FindingKind.SlopeShift, Severity.Warning, p, ratio,
                        $"{moved}: the same change in {c.X} now moves {c.Y} by a different amount; check for a changed formula, rate or unit."));
            }
        }

        Offset(now, bas, t, c, findings);
    }

    /// <summary>
    /// Each run's line evaluated at one reference x (the baseline runs' mean x, where the baseline's data are),
    /// so the test does not depend on where x = 0 lies.
    /// </summary>
    private static void Offset(RunFigures now, BaselineView bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        if (bas.Mean(r => r.XMean) is not { } xRef || bas.Mean(r => r.ResidualSd) is not { } sd0 || !(sd0 > 0) || Level(now, xRef) is not { } l1)
        {
            return;
        }

        var level = RunSpread.Of(bas.Runs.Select(r => Level(r, xRef)).Where(l => l is not null).Select(l => l!.Value), l1.Variance);
        if (level is not { } s)
        {
            return;
        }

        double delta = l1.Value - s.Centre;
        double p = s.TwoSidedP(l1.Value);
        if (!(p < t.Alpha) || !(Math.Abs(delta) >= t.MinOffsetShiftSds * sd0))
        {
            return;
        }

        findings.Add(new Finding(
            FindingKind.OffsetShift,
            Severity.Warning,
            p,
            delta / sd0,
            $"At the same {c.X}, {c.Y} is now {Numbers.Sig(Math.Abs(delta), 4)} {(delta > 0 ? "higher" : "lower")} than in the baseline ({Numbers.Sig(Math.Abs(delta / sd0))} baseline residual SDs, beyond the baseline runs' range, {Numbers.P(p)}): look for a changed offset, default value or baseline in {c.Y}."));
    }

    /// <summary>A run's line at x = <paramref name="xRef"/> and its sampling variance s²/n + SE(b)²(xRef − x̄)².</summary>
    private static (double Value, double Variance)? Level(RunFigures r, double xRef)
    {
        if (r.Intercept is not { } a || r.Slope is not { } b || r.ResidualSd is not { } s || r.XMean is not { } xm || r.SlopeVariance is not { } vb || r.Used < 3)
        {
            return null;
        }

        double dx = xRef - xm;
        return (a + (b * xRef), (s * s / r.Used) + (vb * dx * dx));
    }

    private static void ShapeChanges(RelationshipProfile cur, RunFigures now, BaselineView bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        if (ShapeRules.IsCurved(cur, t) && now.CurvatureGain is { } g1 && !ShapeRules.IsCurved(bas.Pooled, t))
        {
            // Under no change, n·gain/(1 − R²) is about χ²₁: variance 2((1 − R²)/n)² (common practice).
            static double GainVar(RunFigures r) => 2.0 / ((double)r.SampleUsed * r.SampleUsed);
            var gain = RunSpread.Of(bas.Runs.Where(r => r.CurvatureGain is not null && r.SampleUsed > 3).Select(r => (r.CurvatureGain!.Value, GainVar(r))), GainVar(now));
            if (gain is { } s && g1 - s.Centre >= t.CurvatureMinR2Gain && s.IncreaseP(g1) < t.Alpha)
            {
                findings.Add(new Finding(
                    FindingKind.CurvatureAppeared,
                    Severity.Warning,
                    Math.Max(cur.QuadraticP ?? 0, s.IncreaseP(g1)),
                    g1 - s.Centre,
                    $"{c.Y} now bends away from a straight line in {c.X} (quadratic term {Numbers.P(cur.QuadraticP)}, {Numbers.Percent(g1)} more variance explained against {Numbers.Percent(s.Centre)} in the baseline runs), which it did not in the baseline: look for a capped, saturated or re-derived value."));
            }
        }

        if (now.OutlierRate is { } rate1 && cur.OutlierCount is { } k1)
        {
            double pooled = Math.Max(bas.Mean(r => r.OutlierRate) ?? 0, 1.0 / Math.Max(1, now.SampleUsed));
            double RateVar(int n) => pooled * (1 - pooled) / Math.Max(1, n);
            var rates = RunSpread.Of(bas.Runs.Where(r => r.OutlierRate is not null).Select(r => (r.OutlierRate!.Value, RateVar(r.SampleUsed))), RateVar(now.SampleUsed));
            if (rates is { } s && rate1 - s.Centre >= t.MinOutlierRateIncrease && s.IncreaseP(rate1) is var p && p < t.Alpha)
            {
                findings.Add(new Finding(
                    FindingKind.OutlierSurge,
                    Severity.Warning,
                    p,
                    rate1 - s.Centre,
                    $"Rows far off the line of {c.Y} on {c.X} rose from {Numbers.Percent(s.Centre)} in the baseline runs to {Numbers.Percent(rate1)} ({Numbers.Count(k1)} rows, {Numbers.P(p)}): check the new rows for unit, entry or join errors, or a placeholder value."));
            }
        }

        if (now.Leverage && !bas.Ever(r => r.Leverage) && !ProfileFindings.IsLeverage(bas.Pooled, t))
        {
            string without = cur.PearsonRWithoutTopInfluence is { } rw ? $"r would be {Numbers.Sig(rw)} without it" : "r is undefined without it";

            // A row nearly alone in setting the line that also changes r by a material amount changes what every
            // reader of the table sees (a total row among detail rows): critical, as it may be gone at the next load.
            bool decisive = cur.MaxLeverage >= t.CriticalLeverageHat
                && cur.PearsonR is { } r && (cur.PearsonRWithoutTopInfluence is not { } rw2 || Math.Abs(r - rw2) >= t.MinCorrelationChange);
            findings.Add(new Finding(
                FindingKind.LeverageAppeared,
                decisive ? Severity.Critical : Severity.Warning,
                null,
                cur.MaxCooksDistance is { } d && cur.MaxLeverage < 1 ? d : cur.MaxLeverage,
                $"A single row now sets the slope of {c.Y} on {c.X} (leverage {Numbers.Sig(cur.MaxLeverage)}; {without}), which no row did in the baseline: check that row."));
        }
    }

    private static void Rows(RelationshipProfile cur, RunFigures now, BaselineView bas, Thresholds t, ColumnNames c, List<Finding> findings)
    {
        if (now.Rows > 0)
        {
            double pooled = Math.Max(bas.Mean(r => r.DropRate) ?? 0, 1.0 / now.Rows);
            double Var(long n) => pooled * (1 - pooled) / Math.Max(1, n);
            double rate1 = now.DropRate;
            var drops = RunSpread.Of(bas.Runs.Where(r => r.Rows > 0).Select(r => (r.DropRate, Var(r.Rows))), Var(now.Rows));
            if (drops is { } s && rate1 - s.Centre >= t.MinNullRateIncrease && s.IncreaseP(rate1) is var p && p < t.Alpha)
            {
                findings.Add(new Finding(
                    FindingKind.NullSurge,
                    Severity.Warning,
                    p,
                    rate1 - s.Centre,
                    $"Rows without a usable {c.X} or {c.Y} rose from {Numbers.Percent(s.Centre)} in the baseline runs to {Numbers.Percent(rate1)} of {Numbers.Count(now.Rows)} rows (in the sample: {Numbers.Count(cur.NNull)} null, {Numbers.Count(cur.NNonfinite)} non-finite, {Numbers.Count(cur.NNonNumeric)} non-numeric; {Numbers.P(p)}): check the load or join that fills them."));
            }
        }

        if (bas.CompareRowCounts)
        {
            RowCount(now, bas, t, findings);
        }
    }

    /// <summary>
    /// Rows in the window against the baseline runs', on a log scale (counts vary by a factor), with Poisson
    /// variance 1/n per count. Volumes follow the week: a weekend run is compared with the baseline's weekend runs
    /// and a weekday run with its weekday runs (the spread pooled within the two groups). A run of a kind of day
    /// the baseline never saw (a weekend after a baseline of weekdays) is compared with all runs, and only a drop
    /// to half the usual cut counts, since its normal volume is unknown.
    /// </summary>
    private static void RowCount(RunFigures now, BaselineView bas, Thresholds t, List<Finding> findings)
    {
        var runs = bas.Runs.Where(r => r.Used > 0).ToArray();
        if (runs.Length == 0)
        {
            return;
        }

        static bool Weekend(DateTimeOffset at) => at.UtcDateTime.DayOfWeek is DayOfWeek.Saturday or DayOfWeek.Sunday;
        bool nowWeekend = Weekend(now.StartedAt);
        bool grouped = now.StartedAt != default && runs.Any(r => Weekend(r.StartedAt)) && runs.Any(r => !Weekend(r.StartedAt));
        bool unseen = now.StartedAt != default && !runs.Any(r => Weekend(r.StartedAt) == nowWeekend);
        double GroupMean(bool weekend) => runs.Where(r => Weekend(r.StartedAt) == weekend).Average(r => Math.Log(r.Used));
        var values = grouped
            ? runs.Select(r => (Math.Log(r.Used) - GroupMean(Weekend(r.StartedAt)) + GroupMean(nowWeekend), 1.0 / r.Used))
            : runs.Select(r => (Math.Log(r.Used), 1.0 / r.Used));
        if (RunSpread.Of(values, 1.0 / Math.Max(1, now.Used)) is not { } k)
        {
            return;
        }

        double typical = Math.Exp(k.Centre);
        double ratio = now.Used / typical;
        double p = now.Used == 0 ? 0 : k.DecreaseP(Math.Log(now.Used));
        double cut = unseen ? t.SampleShrinkRatio / 2 : t.SampleShrinkRatio;
        if (ratio < cut && p < t.Alpha)
        {
            string which = grouped ? (nowWeekend ? " weekend" : " weekday") : string.Empty;
            findings.Add(new Finding(
                FindingKind.SampleShrank,
                Severity.Warning,
                p,
                ratio,
                $"The window holds {Numbers.Count(now.Used)} usable rows against about {Numbers.Count((long)Math.Round(typical))} in the baseline's{which} runs ({Numbers.Percent(ratio)}, {Numbers.P(p)}): a load may be missing or a filter may cut rows, and every comparison has less power."));
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

    /// <summary>The r of a line with slope <paramref name="b"/> and residual SD <paramref name="sigma"/> over x with SD <paramref name="sx"/>.</summary>
    private static double RangeR(double b, double sigma, double sx) => b * sx / Math.Sqrt((b * b * sx * sx) + (sigma * sigma));

}
