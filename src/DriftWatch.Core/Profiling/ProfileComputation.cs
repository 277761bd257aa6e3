using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Profiling;

/// <summary>
/// The profile's arithmetic. Works on power-of-two-scaled, centred columns throughout and unscales
/// each figure at the end, so extreme magnitudes neither overflow nor lose digits; a figure that
/// still comes out non-finite is reported as null.
/// </summary>
internal static class ProfileComputation
{
    /// <summary>
    /// Rounding allowance of the arithmetic on centred values, in units of ε × the size of the deviations
    /// (the profile's own sums and products, which scale with the spread, not with the magnitude).
    /// </summary>
    private const double ComputationUlps = 16;

    /// <summary>
    /// Rounding allowance of the values themselves, in units of the spacing of doubles at the column's
    /// largest |value|: a derived column rounded once to a double is off by up to half a spacing per
    /// value, and the least-squares line can pass up to a few of those away from a row (rows at |z| up to
    /// about 14 stay within 8 spacings).
    /// </summary>
    private const double RepresentationUlps = 8;

    /// <summary>
    /// The value rounding may excuse residuals only while it is at most this fraction of SD(y). Coarser
    /// than that, float64 cannot tell an exact line from a strong noisy one (integers near 2^63 spread
    /// over a few dozen steps of 1024), and only residuals within the relative tolerance count as exact.
    /// </summary>
    private const double ResolvableFraction = 1e-2;

    public static RelationshipProfile Run(double[] x, double[] y, RelationshipProfile counts, Thresholds t)
    {
        int n = x.Length;
        if (n == 0)
        {
            return counts with
            {
                Shape = Shape.Undefined,
                ShapeReason = "There are no usable rows: every row had a null, non-finite or non-numeric x or y.",
            };
        }

        var rankX = Ranking.Of(x);
        var rankY = Ranking.Of(y);
        var cx = CenteredColumn.Of(x);
        var cy = CenteredColumn.Of(y);
        var profile = counts with
        {
            DistinctX = rankX.Distinct,
            DistinctY = rankY.Distinct,
            XMean = Finite(cx.Mean),
            YMean = Finite(cy.Mean),
            XSd = n >= 2 ? Finite(cx.StandardDeviation) : null,
            YSd = n >= 2 ? Finite(cy.StandardDeviation) : null,
        };

        if (n < 3)
        {
            return profile with
            {
                Shape = Shape.Undefined,
                ShapeReason = $"Only {n} usable row{(n == 1 ? " is" : "s are")} left; a relationship needs at least 3.",
            };
        }

        bool identity = IsIdentity(x, y, cx, cy, t);
        if (cx.IsConstant || cy.IsConstant)
        {
            return profile with
            {
                ExactIdentity = identity,
                Shape = Shape.Undefined,
                ShapeReason = ConstantReason(cx, cy),
            };
        }

        var related = Relationship(x.Length, rankX, rankY, cx, cy, identity, profile, t);
        if (related.ExactAffine)
        {
            return related with { DerivedShare = 1 };
        }

        var derived = DerivedRows.Of(x, y, t.ExactRelativeTolerance * cy.StandardDeviation);
        return related with
        {
            DerivedShare = derived?.Share,
            DerivedEquation = derived is { Share: > 0 } d ? EquationText.Affine(d.Slope, d.Intercept, t.ExactRelativeTolerance * cy.StandardDeviation) : null,
        };
    }

    private static RelationshipProfile Relationship(
        int n, Ranking rankX, Ranking rankY, CenteredColumn cx, CenteredColumn cy, bool identity, RelationshipProfile profile, Thresholds t)
    {
        double[] u = cx.Deviations, v = cy.Deviations;
        var line = LineFit.Of(u, v, cx.SumSquares, cy.SumSquares);
        double r = Correlation.Pearson(line.Sxx, line.Syy, line.Sxy) ?? 0;
        var ci = Correlation.FisherInterval(r, n);

        var order = RankOrders.Of(rankX, rankY);
        double rho = order switch
        {
            RankOrder.Same => 1,
            RankOrder.Reversed => -1,
            _ => Spearman(rankX, rankY),
        };
        double? tau = order switch
        {
            RankOrder.Same => 1,
            RankOrder.Reversed => -1,
            _ => KendallTau.TauB(rankX, rankY),
        };

        int kx = cx.Exponent, ky = cy.Exponent;
        double sScaled = Math.Sqrt(line.Sse / (n - 2));
        double slope = Math.ScaleB(line.Slope, ky - kx);
        double intercept = Math.ScaleB(cy.ScaledMean - (line.Slope * cx.ScaledMean), ky);

        double exactTolerance = ExactTolerance(cx, cy, line, n, t);
        bool affine = line.MaxAbsResidual <= exactTolerance && IsUnitCorrelation(line, exactTolerance, n);
        bool monotone = !affine && order != RankOrder.Mixed && rankX.Distinct >= 3;

        var quadratic = QuadraticFit.Of(u, v, line, rankX.Distinct);
        var influence = Influence.Of(u, line, t.OutlierT);
        double? rWithout = PearsonWithout(u, v, influence.TopInfluenceRow);

        var result = profile with
        {
            PearsonR = r,
            PearsonP = Correlation.PValue(r, n),
            PearsonCiLow = ci?.Low,
            PearsonCiHigh = ci?.High,
            SpearmanRho = rho,
            KendallTauB = tau,
            Intercept = Finite(intercept),
            Slope = Finite(slope),
            SlopeSe = Finite(Math.ScaleB(sScaled / Math.Sqrt(line.Sxx), ky - kx)),
            SlopeSeRobust = Finite(Math.ScaleB(RobustSlopeSe(u, line), ky - kx)),
            InterceptSe = Finite(Math.ScaleB(sScaled * Math.Sqrt((1.0 / n) + (cx.ScaledMean * cx.ScaledMean / line.Sxx)), ky)),
            RSquared = line.RSquared,
            ResidualSd = Finite(Math.ScaleB(sScaled, ky)),
            QuadraticCoef = quadratic is null ? null : Finite(Math.ScaleB(quadratic.Coefficient / (line.Sxx / n), ky - (2 * kx))),
            QuadraticP = quadratic?.PValue,
            QuadraticR2Gain = quadratic?.R2Gain,
            OutlierCount = influence.OutlierCount,
            OutlierRate = influence.OutlierCount is { } k ? (double)k / n : null,
            OutlierTestP = influence.OutlierTestP(n),
            MaxCooksDistance = influence.MaxCooksDistance,
            CooksOverThreshold = influence.CooksOverThreshold,
            MaxLeverage = influence.MaxLeverage,
            PearsonRWithoutTopInfluence = rWithout,
            ExactAffine = affine,
            ExactIdentity = identity,
            ExactMonotone = monotone,
            Equation = affine ? (identity ? "y = x" : EquationText.Affine(slope, intercept, Math.ScaleB(exactTolerance, ky))) : null,
        };

        var (shape, reason) = ShapeRules.Classify(result, influence, t);
        return result with { Shape = shape, ShapeReason = reason };
    }

    /// <summary>
    /// Heteroscedasticity-consistent standard error of the slope, White's (1980) sandwich with the
    /// n/(n − 2) small-sample factor (HC1, MacKinnon and White 1985): √(n/(n − 2) · Σ uᵢ²eᵢ²) / Sxx.
    /// Noise that grows with x or has heavy tails makes the classic SE too small; comparisons use this one.
    /// </summary>
    private static double RobustSlopeSe(double[] u, LineFit line)
    {
        int n = u.Length;
        double[] e = line.Residuals;
        double sum = 0;
        for (int i = 0; i < n; i++)
        {
            double w = u[i] * e[i];
            sum += w * w;
        }

        return Math.Sqrt(sum * n / (n - 2)) / line.Sxx;
    }

    private static double Spearman(Ranking rankX, Ranking rankY)
    {
        // Pearson's r of the mid-ranks, which is Spearman's ρ with ties (common practice).
        double[] a = rankX.MidRanks, b = rankY.MidRanks;
        double centre = (a.Length + 1) * 0.5;
        double sxx = 0, syy = 0, sxy = 0;
        for (int i = 0; i < a.Length; i++)
        {
            double da = a[i] - centre, db = b[i] - centre;
            sxx += da * da;
            syy += db * db;
            sxy += da * db;
        }

        return Correlation.Pearson(sxx, syy, sxy) ?? 0;
    }

    /// <summary>r of the other n − 1 rows, by a fresh two-pass over them (the down-dated sums cancel badly near h = 1).</summary>
    private static double? PearsonWithout(double[] u, double[] v, int skip)
    {
        int n = u.Length;
        if (skip < 0 || n - 1 < 3)
        {
            return null;
        }

        double su = 0, sv = 0;
        for (int i = 0; i < n; i++)
        {
            if (i != skip)
            {
                su += u[i];
                sv += v[i];
            }
        }

        double mu = su / (n - 1), mv = sv / (n - 1);
        double sxx = 0, syy = 0, sxy = 0;
        for (int i = 0; i < n; i++)
        {
            if (i != skip)
            {
                double a = u[i] - mu, b = v[i] - mv;
                sxx += a * a;
                syy += b * b;
                sxy += a * b;
            }
        }

        // Rounding residue of a column that is constant without the row is not variance.
        double floor = 1e-24 * n;
        return sxx > floor && syy > floor ? Correlation.Pearson(sxx, syy, sxy) : null;
    }

    /// <summary>
    /// The exactness tolerance, in scaled y units: the relative tolerance of y's spread, widened to the
    /// rounding of the values themselves only where float64 still resolves the spread, plus the rounding
    /// of the arithmetic on the centred columns.
    /// </summary>
    private static double ExactTolerance(CenteredColumn cx, CenteredColumn cy, LineFit line, int n, Thresholds t)
    {
        double sdY = Math.Sqrt(line.Syy / (n - 1));
        double slope = Math.Abs(line.Slope);
        double representation = RepresentationUlps * (SpacingScaled(cy) + (slope * SpacingScaled(cx)));
        double computation = ComputationUlps * Math.ScaleB(1.0, -52) * (MaxAbs(cy.Deviations) + (slope * MaxAbs(cx.Deviations)));
        double rounding = representation <= ResolvableFraction * sdY ? representation : 0;
        return Math.Max(t.ExactRelativeTolerance * sdY, rounding) + computation;
    }

    /// <summary>
    /// r is ±1 within the tolerance: every |residual| ≤ τ bounds 1 − R² by n τ² / ((n − 1) SD(y)²).
    /// The residual test implies it; checked on its own so a rule change there cannot call r = −0.98 exact.
    /// </summary>
    private static bool IsUnitCorrelation(LineFit line, double tolerance, int n)
    {
        double bound = n * tolerance * tolerance / line.Syy;
        return 1 - line.RSquared <= bound;
    }

    /// <summary>The spacing of doubles at the column's largest |value|, in the column's scaled units.</summary>
    private static double SpacingScaled(CenteredColumn c)
    {
        double maxAbs = c.Unscale(c.MaxAbsScaled);
        int exponent = maxAbs == 0 ? -1022 : Math.Max(Math.ILogB(maxAbs), -1022);
        return Math.ScaleB(1.0, exponent - 52 - c.Exponent);
    }

    private static double MaxAbs(double[] values)
    {
        double max = 0;
        foreach (double v in values)
        {
            max = Math.Max(max, Math.Abs(v));
        }

        return max;
    }

    /// <summary>|y − x| within the same kind of tolerance on every row, in the columns' own units.</summary>
    private static bool IsIdentity(double[] x, double[] y, CenteredColumn cx, CenteredColumn cy, Thresholds t)
    {
        double sdY = x.Length >= 2 ? cy.StandardDeviation : 0;
        double representation = RepresentationUlps * (cy.Unscale(SpacingScaled(cy)) + cx.Unscale(SpacingScaled(cx)));
        double rounding = representation <= ResolvableFraction * sdY ? representation : 0;
        double tolerance = Math.Max(t.ExactRelativeTolerance * sdY, rounding);
        for (int i = 0; i < x.Length; i++)
        {
            if (!(Math.Abs(y[i] - x[i]) <= tolerance))
            {
                return false;
            }
        }

        return true;
    }

    private static string ConstantReason(CenteredColumn cx, CenteredColumn cy)
    {
        if (cx.IsConstant && cy.IsConstant)
        {
            return $"Both columns are constant (x = {Numbers.Sig(cx.Mean, 6)}, y = {Numbers.Sig(cy.Mean, 6)}), so no relationship can be measured.";
        }

        return cx.IsConstant
            ? $"x is constant ({Numbers.Sig(cx.Mean, 6)} on every usable row), so no relationship can be measured."
            : $"y is constant ({Numbers.Sig(cy.Mean, 6)} on every usable row), so no relationship can be measured.";
    }

    private static double? Finite(double value) => double.IsFinite(value) ? value : null;
}
