using DriftWatch.Core.Baselines;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Findings;

/// <summary>
/// A run against the normal range of a baseline's runs. Baseline days are seeded draws of
/// y = 10 + b·x + N(0, σ²), x ~ N(50, 10²), whose slope b and noise σ vary from day to day by a few percent, as
/// production days do (test data). The expected effects follow from the model: a unit change multiplies the
/// slope by an exact factor (NIST SP 811), a narrower spread of x lowers r to b·s/√(b²s² + σ²) (range
/// restriction, common practice), a shuffled key on a share f of rows scales r by about (1 − f).
/// </summary>
public sealed class BaselineRunsTests
{
    private const int N = 5000;
    private static readonly DateTimeOffset Day0 = new(2026, 11, 2, 6, 0, 0, TimeSpan.Zero);

    // Day-to-day wobble: slope within ±3 %, noise within ±10 %.
    private static readonly (double Slope, double Noise)[] Days = [(2.0, 20), (2.05, 18.5), (1.96, 21.5), (2.03, 19), (1.97, 20.8)];

    private static (double[] X, double[] Y) Day(int seed, double slope = 2, double noise = 20, double xSd = 10, int n = N)
    {
        var random = new Random(seed);
        var x = Generated.Normal(random, n, 50, xSd);
        return (x, Generated.Line(random, x, 10, slope, noise));
    }

    private static StoredBaseline Baseline()
    {
        var runs = new List<RunRecord>();
        for (int i = 0; i < Days.Length; i++)
        {
            var sample = Scenarios.Sample(Day(100 + i, Days[i].Slope, Days[i].Noise));
            runs.Add(new RunRecord(i + 1, "p", Day0.AddDays(i), Day0.AddDays(i), RunStatus.Succeeded, null, Scenarios.Profile(sample), [], null, sample, null));
        }

        return BaselineBuilder.Build("p", new BaselinePolicy(), runs, Day0.AddDays(5), s => Profiler.Profile(s, Thresholds.Default))!;
    }

    private static IReadOnlyList<Finding> Assess((double[] X, double[] Y) day)
    {
        var sample = Scenarios.Sample(day);
        return FindingEngine.Assess(Scenarios.Profile(sample), sample, (SourceFigures?)null, Baseline(), PairDeclaration.None, Thresholds.Default, "km", "fuel");
    }

    [Fact]
    public void Baseline_KeepsEachPooledRunsOwnFigures()
    {
        var baseline = Baseline();

        Assert.Equal(5, baseline.Runs.Count);
        Assert.All(baseline.Runs, r => Assert.Equal(N, r.Used));
        Assert.Equal(2.05, baseline.Runs[1].Slope!.Value, 1);
    }

    [Theory]
    [InlineData(200, 2.04, 19.0)]
    [InlineData(201, 1.95, 21.9)]
    [InlineData(202, 2.01, 20.0)]
    public void Assess_AnotherOrdinaryDay_RaisesNothingWarningOrWorse(int seed, double slope, double noise)
    {
        var findings = Assess(Day(seed, slope, noise));

        Assert.DoesNotContain(findings, f => f.Severity >= Severity.Warning);
    }

    [Fact]
    public void Assess_AQuietDayWithANarrowerRangeOfX_IsNoCorrelationShift()
    {
        // x's SD 6 instead of 10: r falls from about 0.71 to about 0.51 for the very same line and scatter.
        var findings = Assess(Day(203, xSd: 6));

        Assert.DoesNotContain(findings, f => f.Kind is FindingKind.CorrelationShift or FindingKind.SlopeShift or FindingKind.OffsetShift);
    }

    [Fact]
    public void Assess_KeyMisalignedOnAThirdOfRows_IsACorrelationShift()
    {
        var (x, y) = Day(204);
        var random = new Random(5);
        var idx = Enumerable.Range(0, N).Where(_ => random.NextDouble() < 0.33).ToArray();
        var shuffled = idx.OrderBy(_ => random.Next()).ToArray();
        var y2 = (double[])y.Clone();
        for (int i = 0; i < idx.Length; i++)
        {
            y2[idx[i]] = y[shuffled[i]];
        }

        var findings = Assess((x, y2));

        var shift = Assert.Single(findings, f => f.Kind == FindingKind.CorrelationShift);
        Assert.Contains("weakened", shift.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Assess_SlopeUpFifteenPercent_IsASlopeShiftWarningNamingNoUnit()
    {
        var findings = Assess(Day(205, slope: 2.3));

        var f = Assert.Single(findings, f => f.Kind == FindingKind.SlopeShift);
        Assert.Equal(Severity.Warning, f.Severity);
        Assert.InRange(f.Effect!.Value, 1.1, 1.2);
    }

    [Theory]
    [InlineData(1.609344, "1.609344")]
    [InlineData(1.56, "1.609344")]
    [InlineData(2.20462, "2.20462")]
    [InlineData(1 / 2.20462, "1/2.20462")]
    public void Assess_UnitChangeOfY_IsACriticalSlopeShiftNamingTheFactor(double factor, string named)
    {
        // A unit change multiplies y, its scatter and so the slope by the factor (NIST SP 811, appendix B, for
        // the exact factors); 1.56 is a ratio off 1.609344 by 3 %, within the baseline runs' own spread.
        var (x, y) = Day(206);
        var findings = Assess((x, [.. y.Select(v => v * factor)]));

        var f = Assert.Single(findings, f => f.Kind == FindingKind.SlopeShift);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.Contains("close to " + named + " ", f.Message, StringComparison.Ordinal);
        Assert.DoesNotContain(findings, g => g.Kind == FindingKind.CorrelationShift);
    }

    [Fact]
    public void Assess_OffsetOfOneResidualSd_IsAnOffsetShift()
    {
        var (x, y) = Day(207);
        var findings = Assess((x, [.. y.Select(v => v + 20)]));

        var f = Assert.Single(findings, f => f.Kind == FindingKind.OffsetShift);
        Assert.Equal(1.0, f.Effect!.Value, 0);
    }

    [Fact]
    public void Assess_NegativeRelationshipWeakening_SaysWeakened()
    {
        // r from about −0.71 to about −0.45: a weaker relationship, although r rose.
        var runs = new List<RunRecord>();
        for (int i = 0; i < 5; i++)
        {
            var s = Scenarios.Sample(Day(300 + i, slope: -2));
            runs.Add(new RunRecord(i + 1, "p", Day0.AddDays(i), Day0.AddDays(i), RunStatus.Succeeded, null, Scenarios.Profile(s), [], null, s, null));
        }

        var baseline = BaselineBuilder.Build("p", new BaselinePolicy(), runs, Day0.AddDays(5), s => Profiler.Profile(s, Thresholds.Default))!;
        var current = Scenarios.Sample(Day(310, slope: -2, noise: 40));
        var findings = FindingEngine.Assess(Scenarios.Profile(current), current, (SourceFigures?)null, baseline, PairDeclaration.None, Thresholds.Default);

        var f = Assert.Single(findings, f => f.Kind == FindingKind.CorrelationShift);
        Assert.Contains("weakened", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Assess_ExactFiguresOfTheWindow_DecideTheRowCount()
    {
        // The sample holds 5,000 rows either way; the window held 50,000 rows in the baseline runs and 16,000 now.
        var sample = Scenarios.Sample(Day(208));
        var profile = Scenarios.Profile(sample);
        var exact = new SourceFigures(16_000, 16_000, 0, profile.PearsonR, profile.Slope, profile.Intercept, profile.XMean, profile.YMean, profile.XSd * profile.XSd, profile.YSd * profile.YSd);
        var baseline = Baseline();
        baseline = baseline with { Runs = [.. baseline.Runs.Select(r => r with { Rows = 50_000, Used = 50_000 })] };

        var findings = FindingEngine.Assess(profile, sample, exact, baseline, PairDeclaration.None, Thresholds.Default);

        var f = Assert.Single(findings, f => f.Kind == FindingKind.SampleShrank);
        Assert.Equal(0.32, f.Effect!.Value, 2);
    }

    [Fact]
    public void Assess_ASmallerMoveTheDayAfterASlopeShift_ConfirmsItAtTheRelaxedLevel()
    {
        // Slope up 7 %: below the 10 % minimum effect on its own, above the 5 % of the relaxed confirmation level.
        var sample = Scenarios.Sample(Day(209, slope: 2.14));
        var profile = Scenarios.Profile(sample);
        var yesterday = new Finding(FindingKind.SlopeShift, Severity.Warning, 1e-6, 1.16, "slope up");
        var baseline = Baseline();

        var alone = FindingEngine.Assess(profile, sample, (SourceFigures?)null, baseline, PairDeclaration.None, Thresholds.Default);
        var confirmed = FindingEngine.Assess(profile, sample, null, baseline, PairDeclaration.None, Thresholds.Default, previous: [yesterday]);
        var opposite = FindingEngine.Assess(profile, sample, null, baseline, PairDeclaration.None, Thresholds.Default, previous: [yesterday with { Effect = 0.84 }]);

        Assert.DoesNotContain(alone, f => f.Kind == FindingKind.SlopeShift);
        var f = Assert.Single(confirmed, f => f.Kind == FindingKind.SlopeShift);
        Assert.Equal(Severity.Warning, f.Severity);
        Assert.Contains("confirms the previous run's finding", f.Message, StringComparison.Ordinal);
        Assert.DoesNotContain(opposite, f => f.Kind == FindingKind.SlopeShift);
    }
}
