using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using MathNetCorrelation = MathNet.Numerics.Statistics.Correlation;

namespace DriftWatch.Core.Tests.Profiling;

/// <summary>Invariances and agreement with MathNet.Numerics as an independent oracle, on seeded random data.</summary>
public sealed class PropertyTests
{
    public static TheoryData<int> Seeds => [1, 2, 3, 4, 5, 6, 7, 8];

    private static PairedSample Correlated(int seed, int n = 300, bool ties = false)
    {
        var random = new Random(seed);
        var x = ties ? Generated.Levels(random, n, 7) : Generated.Normal(random, n, 10, 3);
        var y = Generated.Line(random, x, 1, (seed % 3) - 1, 2);
        if (ties)
        {
            y = [.. y.Select(v => Math.Round(v))];
        }

        return new PairedSample(x, y);
    }

    [Theory]
    [MemberData(nameof(Seeds))]
    public void Pearson_RandomData_EqualsMathNetPearson(int seed)
    {
        var s = Correlated(seed);
        var p = Profiler.Profile(s, Thresholds.Default);

        // MathNet.Numerics Correlation.Pearson as oracle.
        Assert.Equal(MathNetCorrelation.Pearson(s.X, s.Y), p.PearsonR!.Value, 12);
    }

    [Theory]
    [MemberData(nameof(Seeds))]
    public void Spearman_RandomDataWithTies_EqualsMathNetSpearman(int seed)
    {
        var s = Correlated(seed, ties: true);
        var p = Profiler.Profile(s, Thresholds.Default);

        // MathNet.Numerics Correlation.Spearman (average ranks for ties) as oracle.
        Assert.Equal(MathNetCorrelation.Spearman(s.X, s.Y), p.SpearmanRho!.Value, 12);
    }

    [Theory]
    [MemberData(nameof(Seeds))]
    public void KendallTauB_SmallRandomDataWithTies_EqualsNaivePairCount(int seed)
    {
        var random = new Random(seed);
        int n = 20 + random.Next(60);
        var x = Generated.Levels(random, n, 2 + random.Next(8));
        var y = x.Select(v => Math.Round(v + (3 * random.NextDouble()) - 1.5)).ToArray();
        var p = Profiler.Profile(new PairedSample(x, y), Thresholds.Default);

        // Kendall (1945) τ-b = (C − D) / √((n0 − n1)(n0 − n2)), counted pair by pair in O(n²).
        Assert.Equal(NaiveTauB(x, y), p.KendallTauB!.Value, 12);
    }

    [Fact]
    public void KendallTauB_NoTies_EqualsTheClassicTau()
    {
        // Without ties τ-b reduces to Kendall's (1938) τ = 1 − 4·(discordant pairs)/(n(n − 1)): among
        // n = 5 rows, one swapped neighbour pair gives 1 − 4/20 = 0.8, two give 1 − 8/20 = 0.6.
        var p = Profiler.Profile(new PairedSample([1, 2, 3, 4, 5], [1, 3, 2, 4, 5]), Thresholds.Default);

        Assert.Equal(0.8, p.KendallTauB!.Value, 14);
        var q = Profiler.Profile(new PairedSample([1, 2, 3, 4, 5], [2, 1, 4, 3, 5]), Thresholds.Default);
        Assert.Equal(0.6, q.KendallTauB!.Value, 14);
    }

    [Theory]
    [MemberData(nameof(Seeds))]
    public void Pearson_PositiveAffineMapsOfBothColumns_LeaveRUnchanged(int seed)
    {
        // r is invariant under x → a + b·x, y → c + d·y with b, d > 0 (common practice).
        var s = Correlated(seed);
        var random = new Random(seed + 100);
        double a = (random.NextDouble() - 0.5) * 1e4, b = Math.Exp((random.NextDouble() * 10) - 5);
        double c = (random.NextDouble() - 0.5) * 1e4, d = Math.Exp((random.NextDouble() * 10) - 5);
        var mapped = new PairedSample([.. s.X.Select(v => a + (b * v))], [.. s.Y.Select(v => c + (d * v))]);

        var p = Profiler.Profile(s, Thresholds.Default);
        var q = Profiler.Profile(mapped, Thresholds.Default);

        Assert.Equal(p.PearsonR!.Value, q.PearsonR!.Value, 9);
        Assert.Equal(p.SpearmanRho!.Value, q.SpearmanRho!.Value, 12);
        Assert.Equal(p.KendallTauB!.Value, q.KendallTauB!.Value, 12);
        Assert.Equal(p.Slope!.Value * d / b, q.Slope!.Value, 6);
    }

    [Theory]
    [MemberData(nameof(Seeds))]
    public void Profile_AnyRandomData_KeepsCorrelationsWithinMinusOneAndOne(int seed)
    {
        var random = new Random(seed);
        var x = Generated.Normal(random, 50);
        var y = seed % 2 == 0 ? [.. x.Select(v => (v * 3) + (1e-12 * random.NextDouble()))] : Generated.Normal(random, 50);
        var p = Profiler.Profile(new PairedSample(x, y), Thresholds.Default);

        Assert.InRange(p.PearsonR!.Value, -1, 1);
        Assert.InRange(p.SpearmanRho!.Value, -1, 1);
        Assert.InRange(p.KendallTauB!.Value, -1, 1);
        Assert.InRange(p.PearsonCiLow!.Value, -1, p.PearsonR.Value);
        Assert.InRange(p.PearsonCiHigh!.Value, p.PearsonR.Value, 1);
        Assert.InRange(p.RSquared!.Value, 0, 1);
        NumericalAccuracyTests.AssertNoNonFinite(p);
    }

    [Theory]
    [MemberData(nameof(Seeds))]
    public void Profile_ShuffledRows_GiveTheSameFiguresAndShape(int seed)
    {
        var s = Correlated(seed, 400, ties: seed % 2 == 0);
        var order = Enumerable.Range(0, s.UsedCount).ToArray();
        new Random(seed + 7).Shuffle(order);
        var shuffled = new PairedSample([.. order.Select(i => s.X[i])], [.. order.Select(i => s.Y[i])]);

        var p = Profiler.Profile(s, Thresholds.Default);
        var q = Profiler.Profile(shuffled, Thresholds.Default);

        Assert.Equal(p.Shape, q.Shape);
        Assert.Equal(p.PearsonR!.Value, q.PearsonR!.Value, 12);
        Assert.Equal(p.SpearmanRho!.Value, q.SpearmanRho!.Value, 12);
        Assert.Equal(p.KendallTauB!.Value, q.KendallTauB!.Value, 12);
        Assert.Equal(p.OutlierCount, q.OutlierCount);
        Assert.Equal(p.MaxCooksDistance!.Value, q.MaxCooksDistance!.Value, 9);
        Assert.Equal(p.PearsonRWithoutTopInfluence!.Value, q.PearsonRWithoutTopInfluence!.Value, 9);
    }

    public static TheoryData<int, int> QuadraticCases => new()
    {
        { 1, 120 }, { 2, 120 }, { 3, 120 }, { 4, 120 },

        // Larger samples: the same agreement must hold when rounding has more rows to accumulate over.
        { 5, 2049 }, { 6, 5000 }, { 7, 9000 },
    };

    [Theory]
    [MemberData(nameof(QuadraticCases))]
    public void Quadratic_RandomCurvedData_MatchesMathNetPolynomialFitAndNormalEquations(int seed, int n)
    {
        var random = new Random(seed);
        var x = Generated.Uniform(random, n, -3, 6);
        var y = x.Select(v => 2 + v + (0.3 * v * v) + Generated.Normal(random, 1, 0, 2)[0]).ToArray();
        var p = Profiler.Profile(new PairedSample(x, y), Thresholds.Default);

        // MathNet Fit.Polynomial (a different solver on the raw x) as oracle for the x² coefficient.
        var coefficients = MathNet.Numerics.Fit.Polynomial(x, y, 2);
        Assert.Equal(coefficients[2], p.QuadraticCoef!.Value, 9);

        // The t-test of the x² term from the textbook formula SE = s·√[(XᵀX)⁻¹]₂₂ (common practice).
        var design = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.Dense(x.Length, 3, (i, j) => Math.Pow(x[i], j));
        var xtxInverse = (design.TransposeThisAndMultiply(design)).Inverse();
        var beta = xtxInverse * design.TransposeThisAndMultiply(MathNet.Numerics.LinearAlgebra.Vector<double>.Build.Dense(y));
        var residuals = MathNet.Numerics.LinearAlgebra.Vector<double>.Build.Dense(y) - (design * beta);
        double s2 = residuals.DotProduct(residuals) / (x.Length - 3);
        double t = beta[2] / Math.Sqrt(s2 * xtxInverse[2, 2]);
        double expectedP = 2 * MathNet.Numerics.Distributions.StudentT.CDF(0, 1, x.Length - 3, -Math.Abs(t));
        Assert.True(Math.Abs(expectedP - p.QuadraticP!.Value) <= Math.Max(1e-9, 1e-6 * expectedP), $"p {p.QuadraticP} against {expectedP}");

        // R² gain = (SSE of the line − SSE of the quadratic) / Syy, with MathNet Fit.Line for the line.
        var (a, b) = MathNet.Numerics.Fit.Line(x, y);
        double sseLine = x.Select((v, i) => Math.Pow(y[i] - a - (b * v), 2)).Sum();
        double yMean = y.Average();
        double syy = y.Select(v => Math.Pow(v - yMean, 2)).Sum();
        Assert.Equal((sseLine - (s2 * (x.Length - 3))) / syy, p.QuadraticR2Gain!.Value, 9);
        Assert.Equal(Shape.Curved, p.Shape);
    }

    [Theory]
    [MemberData(nameof(Seeds))]
    public void Influence_SmallRandomData_MatchesHatMatrixAndLeaveOneOutRefits(int seed)
    {
        var random = new Random(seed);
        int n = 12 + random.Next(20);
        var x = Generated.Normal(random, n, 0, 2);
        var y = Generated.Line(random, x, 1, 0.5, 1);
        y[random.Next(n)] += 6;
        var p = Profiler.Profile(new PairedSample(x, y), Thresholds.Default);

        // Oracle: the hat matrix H = X(XᵀX)⁻¹Xᵀ built with MathNet (n × n, fine at this size), Cook's
        // (1977) D from the change of all fitted values when a row is left out, and the externally
        // studentized residual (Belsley, Kuh and Welsch 1980) from a refit without the row.
        var (maxH, maxD, over, outliers, rWithout) = BruteForceInfluence(x, y, Thresholds.DefaultOutlierT);
        Assert.Equal(maxH, p.MaxLeverage!.Value, 10);
        Assert.Equal(maxD, p.MaxCooksDistance!.Value, 9);
        Assert.Equal(over, p.CooksOverThreshold);
        Assert.Equal(outliers, p.OutlierCount);
        Assert.Equal(rWithout, p.PearsonRWithoutTopInfluence!.Value, 10);
    }

    private static double NaiveTauB(double[] x, double[] y)
    {
        long concordant = 0, discordant = 0, tiedXOnly = 0, tiedYOnly = 0;
        int n = x.Length;
        for (int i = 0; i < n; i++)
        {
            for (int j = i + 1; j < n; j++)
            {
                int sx = Math.Sign(x[i] - x[j]), sy = Math.Sign(y[i] - y[j]);
                if (sx == 0 && sy == 0)
                {
                    continue;
                }

                if (sx == 0)
                {
                    tiedXOnly++;
                }
                else if (sy == 0)
                {
                    tiedYOnly++;
                }
                else if (sx == sy)
                {
                    concordant++;
                }
                else
                {
                    discordant++;
                }
            }
        }

        double untiedX = concordant + discordant + tiedYOnly;
        double untiedY = concordant + discordant + tiedXOnly;
        return (concordant - discordant) / Math.Sqrt(untiedX * untiedY);
    }

    private static (double MaxH, double MaxD, int Over, int Outliers, double RWithout) BruteForceInfluence(double[] x, double[] y, double tCut)
    {
        var m = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build;
        var v = MathNet.Numerics.LinearAlgebra.Vector<double>.Build;
        int n = x.Length;
        var design = m.Dense(n, 2, (i, j) => j == 0 ? 1 : x[i]);
        var hat = design * design.TransposeThisAndMultiply(design).Inverse() * design.Transpose();
        var yv = v.Dense(y);
        var fitted = hat * yv;
        var e = yv - fitted;
        double s2 = e.DotProduct(e) / (n - 2);
        double maxH = 0, maxD = 0;
        int over = 0, outliers = 0, top = 0;
        for (int k = 0; k < n; k++)
        {
            maxH = Math.Max(maxH, hat[k, k]);
            var keep = Enumerable.Range(0, n).Where(i => i != k).ToArray();
            var (a, b) = MathNet.Numerics.Fit.Line([.. keep.Select(i => x[i])], [.. keep.Select(i => y[i])]);
            double change = Enumerable.Range(0, n).Sum(i => Math.Pow(fitted[i] - (a + (b * x[i])), 2));
            double d = change / (2 * s2);
            double sse = keep.Sum(i => Math.Pow(y[i] - a - (b * x[i]), 2));
            double t = e[k] / Math.Sqrt(sse / (n - 3) * (1 - hat[k, k]));
            over += d > 4.0 / n ? 1 : 0;
            outliers += Math.Abs(t) > tCut ? 1 : 0;
            if (d > maxD)
            {
                maxD = d;
                top = k;
            }
        }

        var rest = Enumerable.Range(0, n).Where(i => i != top).ToArray();
        double rWithout = MathNetCorrelation.Pearson(rest.Select(i => x[i]), rest.Select(i => y[i]));
        return (maxH, maxD, over, outliers, rWithout);
    }
}
