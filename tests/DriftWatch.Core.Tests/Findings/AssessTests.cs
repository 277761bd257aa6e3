using DriftWatch.Core.History;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Findings;

public sealed class AssessTests
{
    private static readonly PairedSample Baseline = Scenarios.Sample(Scenarios.Draw(seed: 1));

    private static IReadOnlyList<Finding> Assess(PairedSample current, PairDeclaration? declared = null, bool withBaseline = true) =>
        FindingEngine.Assess(
            Scenarios.Profile(current),
            current,
            withBaseline ? Scenarios.Profile(Baseline) : null,
            withBaseline ? Baseline : null,
            declared ?? PairDeclaration.None,
            Thresholds.Default);

    [Fact]
    public void Assess_BecameCopy_ReportsBecamePerfectWithoutItsEchoes()
    {
        var (x, _) = Scenarios.Draw(seed: 31);
        var findings = Assess(new PairedSample(x, [.. x]));

        Assert.Equal(FindingKind.BecamePerfect, findings[0].Kind);
        Assert.DoesNotContain(findings, f => f.Kind is FindingKind.PerfectRelationship or FindingKind.CorrelationShift or FindingKind.SlopeShift);
    }

    [Fact]
    public void Assess_SignFlip_SupersedesCorrelationAndSlopeShift()
    {
        var findings = Assess(Scenarios.Sample(Scenarios.Draw(seed: 32, slope: -2, intercept: 210)), new PairDeclaration(DeclaredDirection.Positive));

        Assert.Single(findings, f => f.Kind == FindingKind.SignFlip);
        Assert.DoesNotContain(findings, f => f.Kind is FindingKind.CorrelationShift or FindingKind.SlopeShift or FindingKind.OffsetShift);
    }

    [Fact]
    public void Assess_UnitChange_ReportsSlopeShiftButNotTheOffsetItImplies()
    {
        var (x, y) = Scenarios.Draw(seed: 33);
        var findings = Assess(new PairedSample(x, [.. y.Select(v => v * 1000)]));

        Assert.Contains(findings, f => f.Kind == FindingKind.SlopeShift);
        Assert.DoesNotContain(findings, f => f.Kind == FindingKind.OffsetShift);
    }

    [Fact]
    public void Assess_OneNewRowFarOutInX_ReportsLeverageInsteadOfTheShiftsItCauses()
    {
        var (x, y) = Scenarios.Draw(seed: 38);
        x[0] = 1000;
        y[0] = 0;
        var current = new PairedSample(x, y);

        var compared = FindingEngine.Compare(
            Scenarios.Profile(current), current, Scenarios.Profile(Baseline), Baseline, PairDeclaration.None, Thresholds.Default);
        var assessed = Assess(current);

        // The raw comparison sees r and the slope collapse; without that row they are the baseline's.
        Assert.Contains(compared, f => f.Kind == FindingKind.CorrelationShift);
        Assert.Contains(compared, f => f.Kind == FindingKind.SlopeShift);
        Assert.Equal([FindingKind.LeverageAppeared], assessed.Select(f => f.Kind));
    }

    [Fact]
    public void Assess_SeveralFindings_AreOrderedBySeverityWorstFirst()
    {
        var (x, y) = Scenarios.Draw(seed: 34, n: 600, xMean: 65, slope: -2, intercept: 210);
        var findings = Assess(new PairedSample(x, y, nullCount: 300));

        Assert.True(findings.Count >= 3);
        Assert.Equal(findings.OrderByDescending(f => f.Severity).Select(f => f.Severity), findings.Select(f => f.Severity));
        Assert.Equal(Severity.Critical, findings[0].Severity);
        Assert.Equal(Severity.Info, findings[^1].Severity);
    }

    [Fact]
    public void Assess_WithoutBaseline_IsTheProfileFindingsOnly()
    {
        var sample = ReferenceData.Anscombe(3);
        var expected = FindingEngine.ForProfile(Scenarios.Profile(sample), PairDeclaration.None, Thresholds.Default);
        var actual = FindingEngine.Assess(Scenarios.Profile(sample), sample, (SourceFigures?)null, (StoredBaseline?)null, PairDeclaration.None, Thresholds.Default);

        Assert.Equal(expected, actual);
    }

    [Fact]
    public void Assess_BaselineProfileWithoutSample_SkipsOnlyTheMarginalTests()
    {
        var current = Scenarios.Sample(Scenarios.Draw(seed: 35, xMean: 60, intercept: 40));
        var findings = FindingEngine.Assess(
            Scenarios.Profile(current), current, Scenarios.Profile(Baseline), null, PairDeclaration.None, Thresholds.Default);

        Assert.DoesNotContain(findings, f => f.Kind == FindingKind.MarginalShift);
        Assert.Contains(findings, f => f.Kind == FindingKind.OffsetShift);
    }

    [Theory]
    [InlineData(36)]
    [InlineData(37)]
    public void Assess_ShuffledRows_GiveTheSameFindings(int seed)
    {
        var (x, y) = Scenarios.Draw(seed, slope: 2.7, noise: 40);
        x[0] = 400;
        var order = Enumerable.Range(0, x.Length).ToArray();
        new Random(seed).Shuffle(order);
        var original = Assess(new PairedSample(x, y));
        var shuffled = Assess(new PairedSample([.. order.Select(i => x[i])], [.. order.Select(i => y[i])]));

        Assert.NotEmpty(original);
        Assert.Equal(original.Select(f => (f.Kind, f.Severity)), shuffled.Select(f => (f.Kind, f.Severity)));
        Assert.Equal(original.Select(f => f.Effect ?? 0), shuffled.Select(f => f.Effect ?? 0), new ToleranceComparer(1e-9));
    }

    private sealed class ToleranceComparer(double tolerance) : IEqualityComparer<double>
    {
        public bool Equals(double a, double b) => Math.Abs(a - b) <= tolerance * Math.Max(1, Math.Abs(a));

        public int GetHashCode(double value) => 0;
    }
}
