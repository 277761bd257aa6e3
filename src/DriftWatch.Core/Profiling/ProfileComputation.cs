using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Profiling;

/// <summary>
/// The profile's arithmetic. Works on power-of-two-scaled, centred columns throughout and unscales
/// each figure at the end, so extreme magnitudes neither overflow nor lose digits; a figure that
/// still comes out non-finite is reported as null.
/// </summary>
internal static class ProfileComputation
{
    /// <summary>Rounding allowance, in units of ε × magnitude, before a residual counts as non-zero.</summary>
    private const double RoundingUlps = 16;

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

        // The exactness tolerance, in scaled y units: relative to y's spread, but never finer than the
        // rounding of the values themselves (y's magnitude and the size of slope·x).
        double sdYScaled = Math.Sqrt(line.Syy / (n - 1));
        double rounding = RoundingUlps * Math.ScaleB(1.0, -52) * (cy.MaxAbsScaled + (Math.Abs(line.Slope) * cx.MaxAbsScaled));
        double exactTolerance = Math.Max(t.ExactRelativeTolerance * sdYScaled, rounding);
        bool affine = line.MaxAbsResidual <= exactTolerance;
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

    private static bool IsIdentity(double[] x, double[] y, CenteredColumn cx, CenteredColumn cy, Thresholds t)
    {
        double maxAbs = Math.Max(Math.Abs(cx.Unscale(cx.MaxAbsScaled)), Math.Abs(cy.Unscale(cy.MaxAbsScaled)));
        double tolerance = Math.Max(
            x.Length >= 2 ? t.ExactRelativeTolerance * cy.StandardDeviation : 0,
            RoundingUlps * Math.ScaleB(1.0, -52) * maxAbs);
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
