using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Profiling;

/// <summary>Bad or awkward data never throws and never yields NaN or infinity (the profile's contract).</summary>
public sealed class RobustnessTests
{
    public static TheoryData<int> Seeds => [.. Enumerable.Range(1, 40)];

    private static double Awkward(Random random) => random.Next(9) switch
    {
        0 => 0,
        1 => random.Next(3),
        2 => (random.NextDouble() - 0.5) * 1e300,
        3 => random.NextDouble() * 1e-300,
        4 => double.MaxValue * (random.NextDouble() - 0.5),
        5 => 1e9 + random.Next(3),
        6 => -0.0,
        7 => double.Epsilon * random.Next(5),
        _ => random.NextDouble(),
    };

    [Theory]
    [MemberData(nameof(Seeds))]
    public void ProfileAndAssess_AwkwardValues_NeverThrowAndStayFinite(int seed)
    {
        var random = new Random(seed);
        int n = random.Next(12) switch { 0 => 0, 1 => 1, 2 => 2, 3 => 3, 4 => 4, _ => 5 + random.Next(300) };
        bool allOneKind = random.Next(4) == 0;
        int kind = random.Next(9);
        var x = new double[n];
        var y = new double[n];
        for (int i = 0; i < n; i++)
        {
            x[i] = allOneKind ? Awkward(new Random(kind)) : Awkward(random);
            y[i] = random.Next(3) == 0 ? x[i] : Awkward(random);
        }

        var sample = new PairedSample(x, y, nullCount: random.Next(3));
        var profile = Profiler.Profile(sample, Thresholds.Default);
        var baselineSample = new PairedSample(Generated.Normal(random, 50), Generated.Normal(random, 50));
        var baseline = Profiler.Profile(baselineSample, Thresholds.Default);
        var findings = FindingEngine.Assess(profile, sample, baseline, baselineSample, new PairDeclaration(DeclaredDirection.Positive, random.Next(2) == 0), Thresholds.Default);
        var reverse = FindingEngine.Assess(baseline, baselineSample, profile, sample, PairDeclaration.None, Thresholds.Default);

        NumericalAccuracyTests.AssertNoNonFinite(profile);
        Assert.False(string.IsNullOrWhiteSpace(profile.ShapeReason));
        Assert.All(findings.Concat(reverse), f =>
        {
            Assert.True(f.PValue is null || (f.PValue >= 0 && f.PValue <= 1), $"{f.Kind} p = {f.PValue}");
            Assert.True(f.Effect is null || double.IsFinite(f.Effect.Value), $"{f.Kind} effect = {f.Effect}");
            Assert.DoesNotContain("NaN", f.Message, StringComparison.Ordinal);
        });
    }
}
