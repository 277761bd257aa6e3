using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Findings;

/// <summary>
/// Each comparison rule fires on a scenario built to trigger it and stays quiet on the control: two
/// independent draws from the same distribution. Data are seeded random draws (test data).
/// </summary>
public sealed class ComparisonFindingsTests
{
    private static readonly PairedSample Baseline = Scenarios.Sample(Scenarios.Draw(seed: 1));

    private static IReadOnlyList<Finding> Compare(PairedSample current, PairDeclaration? declared = null) =>
        FindingEngine.Compare(
            Scenarios.Profile(current), current, Scenarios.Profile(Baseline), Baseline, declared ?? PairDeclaration.None, Thresholds.Default, "weight_declared", "weight_measured");

    private static Finding Single(IReadOnlyList<Finding> findings, FindingKind kind) => Assert.Single(findings, f => f.Kind == kind);

    [Theory]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(4)]
    public void Compare_IndependentDrawFromTheSameDistribution_RaisesNothing(int seed)
    {
        var findings = Compare(Scenarios.Sample(Scenarios.Draw(seed)));

        Assert.Empty(findings);
    }

    [Fact]
    public void Compare_YBecameACopyOfX_IsBecamePerfectCritical()
    {
        var (x, _) = Scenarios.Draw(seed: 5);
        var findings = Compare(new PairedSample(x, [.. x]));

        var f = Single(findings, FindingKind.BecamePerfect);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.Equal(1.0, f.Effect!.Value, 12);
        Assert.Contains("weight_measured became an exact copy of weight_declared", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Compare_YBecameDerivedButPairIsDeclaredExact_IsNotBecamePerfect()
    {
        var (x, _) = Scenarios.Draw(seed: 5);
        var findings = Compare(new PairedSample(x, [.. x.Select(v => 2 * v)]), new PairDeclaration(Exact: true));

        Assert.DoesNotContain(findings, f => f.Kind == FindingKind.BecamePerfect);
    }

    [Fact]
    public void Compare_NoiseGrew_IsCorrelationShift()
    {
        var findings = Compare(Scenarios.Sample(Scenarios.Draw(seed: 6, noise: 40)));

        var f = Single(findings, FindingKind.CorrelationShift);
        Assert.Equal(Severity.Warning, f.Severity);
        Assert.True(f.PValue < Thresholds.DefaultAlpha);
        Assert.True(f.Effect < -Thresholds.DefaultMinCorrelationChange);
        Assert.Contains("weakened", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Compare_TinyButSignificantChangeOnHugeSample_IsNotCorrelationShift()
    {
        // Fisher z finds Δr ≈ 0.03 significant at n = 200,000, but it is below MinCorrelationChange.
        var big = Scenarios.Sample(Scenarios.Draw(seed: 7, n: 200_000, noise: 20));
        var bigger = Scenarios.Sample(Scenarios.Draw(seed: 8, n: 200_000, noise: 22));
        var findings = FindingEngine.Compare(
            Scenarios.Profile(bigger), bigger, Scenarios.Profile(big), big, PairDeclaration.None, Thresholds.Default);

        Assert.DoesNotContain(findings, f => f.Kind == FindingKind.CorrelationShift);
    }

    [Fact]
    public void Compare_SlopeReversed_IsSignFlipCritical()
    {
        var findings = Compare(Scenarios.Sample(Scenarios.Draw(seed: 9, slope: -2, intercept: 210)));

        var f = Single(findings, FindingKind.SignFlip);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.True(f.Effect < -1);
    }

    [Fact]
    public void Compare_YNoLongerDependsOnX_IsRelationshipLostCritical()
    {
        var findings = Compare(Scenarios.Sample(Scenarios.Draw(seed: 10, slope: 0, intercept: 110)));

        var f = Single(findings, FindingKind.RelationshipLost);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.True(f.PValue < 1e-10);
    }

    [Theory]
    [InlineData(1000.0, "1000")]
    [InlineData(1 / 0.45359237, "2.20462")]
    [InlineData(0.01, "1/100")]
    [InlineData(1 / 1.609344, "1/1.609344")]
    [InlineData(3.6, "3.6")]
    public void Compare_YChangedUnit_IsSlopeShiftNamingTheUnitFactor(double factor, string shown)
    {
        // A unit change multiplies y (and its noise) by the factor: r stays, the slope moves by it.
        // Factors: NIST SP 811 appendix B (1 lb = 0.45359237 kg, 1 mi = 1.609344 km, 1 kWh = 3.6 MJ).
        // A tight measurement pair (r ≈ 0.97), so two draws' slopes agree within UnitFactorTolerance.
        var baseline = Scenarios.Sample(Scenarios.Draw(seed: 1, noise: 5));
        var (x, y) = Scenarios.Draw(seed: 11, noise: 5);
        var current = new PairedSample(x, [.. y.Select(v => v * factor)]);
        var findings = FindingEngine.Compare(
            Scenarios.Profile(current), current, Scenarios.Profile(baseline), baseline, PairDeclaration.None, Thresholds.Default, "weight_declared", "weight_measured");

        var f = Single(findings, FindingKind.SlopeShift);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.Contains("a unit change keeps r and moves the slope", f.Message, StringComparison.Ordinal);
        Assert.Contains("close to " + shown + " ", f.Message, StringComparison.Ordinal);
        Assert.Equal(factor, f.Effect!.Value, factor * Thresholds.DefaultUnitFactorTolerance);
        Assert.DoesNotContain(findings, g => g.Kind == FindingKind.CorrelationShift);
    }

    [Fact]
    public void Compare_SlopeGrewByAThird_IsSlopeShiftWithoutUnitClaim()
    {
        var findings = Compare(Scenarios.Sample(Scenarios.Draw(seed: 12, slope: 2.7, intercept: 10, noise: 27)));

        var f = Single(findings, FindingKind.SlopeShift);
        Assert.Equal(Severity.Warning, f.Severity);
        Assert.DoesNotContain("unit change", f.Message, StringComparison.Ordinal);
        Assert.InRange(f.Effect!.Value, 1.2, 1.5);
    }

    [Fact]
    public void Compare_YShiftedByOneAndAHalfResidualSds_IsOffsetShift()
    {
        var findings = Compare(Scenarios.Sample(Scenarios.Draw(seed: 13, intercept: 40)));

        var f = Single(findings, FindingKind.OffsetShift);
        Assert.InRange(f.Effect!.Value, 1.2, 1.8);
        Assert.Contains("higher", f.Message, StringComparison.Ordinal);
        Assert.DoesNotContain(findings, g => g.Kind == FindingKind.SlopeShift);
    }

    [Fact]
    public void Compare_QuadraticTermAppeared_IsCurvatureAppeared()
    {
        var random = new Random(14);
        var x = Generated.Normal(random, Scenarios.N, 50, 10);
        var y = x.Select(v => 10 + (2 * v) + (0.1 * (v - 50) * (v - 50)) + Generated.Normal(random, 1, 0, 20)[0]).ToArray();
        var findings = Compare(new PairedSample(x, y));

        var f = Single(findings, FindingKind.CurvatureAppeared);
        Assert.True(f.PValue < 1e-6);
        Assert.True(f.Effect > 0.1);
    }

    [Fact]
    public void Compare_FivePercentOfRowsInWrongUnits_IsOutlierSurge()
    {
        var (x, y) = Scenarios.Draw(seed: 15);
        for (int i = 0; i < y.Length; i += 20)
        {
            y[i] += 200;
        }

        var findings = Compare(new PairedSample(x, y));

        var f = Single(findings, FindingKind.OutlierSurge);
        Assert.InRange(f.Effect!.Value, 0.04, 0.06);
        Assert.True(f.PValue < 1e-10);
    }

    [Fact]
    public void Compare_OneRowFarOutInX_IsLeverageAppeared()
    {
        var (x, y) = Scenarios.Draw(seed: 16);
        x[0] = 1000;
        y[0] = 0;
        var findings = Compare(new PairedSample(x, y));

        var f = Single(findings, FindingKind.LeverageAppeared);

        // The row at x = 1000, y = 0 turns r negative, but its hat value (about 0.8: 950² against the other rows'
        // spread, hᵢ = 1/n + (xᵢ − x̄)²/Sxx) leaves it short of nearly alone: a warning, confirmed by a second run.
        var p = Scenarios.Profile(new PairedSample(x, y));
        Assert.InRange(p.MaxLeverage!.Value, 0.5, Thresholds.Default.CriticalLeverageHat);
        Assert.Equal(Severity.Warning, f.Severity);
        Assert.Contains("single row", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Compare_ATotalRowAmongTheDetailRows_IsLeverageAppearedCritical()
    {
        // A row holding the column totals: its x is n times the mean, so its hat value is close to 1.
        var (x, y) = Scenarios.Draw(seed: 20);
        double[] wx = [.. x, x.Sum()], wy = [.. y, y.Sum()];
        var findings = Compare(new PairedSample(wx, wy));

        var f = Single(findings, FindingKind.LeverageAppeared);
        Assert.True(Scenarios.Profile(new PairedSample(wx, wy)).MaxLeverage >= Thresholds.Default.CriticalLeverageHat);
        Assert.Equal(Severity.Critical, f.Severity);
    }

    [Fact]
    public void Compare_TwentyPercentNulls_IsNullSurge()
    {
        var findings = Compare(Scenarios.Sample(Scenarios.Draw(seed: 17), nulls: 500));

        var f = Single(findings, FindingKind.NullSurge);
        Assert.Equal(0.2, f.Effect!.Value, 6);
        Assert.Contains("500 null", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Compare_TwoExtractsOfDifferentLengths_AreNotASampleShrank()
    {
        // Two extracts are as long as they were cut; only runs of one window have comparable row counts
        // (BaselineRunsTests covers the window's exact counts).
        var findings = Compare(Scenarios.Sample(Scenarios.Draw(seed: 18, n: 500)));

        Assert.DoesNotContain(findings, g => g.Kind is FindingKind.SampleShrank or FindingKind.CorrelationShift or FindingKind.SlopeShift);
    }

    [Fact]
    public void Compare_PopulationMovedAlongTheSameLine_IsMarginalShiftOnly()
    {
        var findings = Compare(Scenarios.Sample(Scenarios.Draw(seed: 19, xMean: 60)));

        Assert.All(findings, f => Assert.Equal(FindingKind.MarginalShift, f.Kind));
        Assert.Equal(2, findings.Count);
        Assert.Contains(findings, f => f.Message.Contains("of weight_declared shifted", StringComparison.Ordinal));
        Assert.All(findings, f => Assert.Equal(Severity.Info, f.Severity));
    }
}
