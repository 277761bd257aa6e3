using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Findings;

/// <summary>
/// sample_shrank against a baseline pooled from several runs (first_runs: 5): the pool holds five runs' worth of
/// points, so the rule must compare a run's usable rows with the pooled runs' mean (StoredBaseline.MeanRunUsed),
/// not with the pool's count. Data are seeded random draws (test data), as in <see cref="Scenarios"/>.
/// </summary>
public sealed class PooledBaselineSizeTests
{
    private const int RunRows = 600;
    private const int PooledRuns = 5;

    private static readonly PairedSample Pool = Pooled();

    private static PairedSample Pooled()
    {
        var x = new List<double>();
        var y = new List<double>();
        for (var seed = 1; seed <= PooledRuns; seed++)
        {
            var (dx, dy) = Scenarios.Draw(seed, n: RunRows);
            x.AddRange(dx);
            y.AddRange(dy);
        }

        return new PairedSample([.. x], [.. y]);
    }

    private static IReadOnlyList<Finding> Assess(PairedSample current, double? baselineRunUsed) =>
        FindingEngine.Assess(
            Scenarios.Profile(current), current, Scenarios.Profile(Pool), Pool, PairExpectation.Default, Thresholds.Default, "x", "y", baselineRunUsed);

    [Fact]
    public void Assess_RunAsLargeAsEachPooledRun_IsNotSampleShrank()
    {
        var findings = Assess(Scenarios.Sample(Scenarios.Draw(seed: 40, n: RunRows)), baselineRunUsed: RunRows);

        Assert.DoesNotContain(findings, f => f.Kind == FindingKind.SampleShrank);
    }

    [Fact]
    public void Assess_RunAQuarterOfEachPooledRun_IsSampleShrankAgainstThePerRunSize()
    {
        var findings = Assess(Scenarios.Sample(Scenarios.Draw(seed: 41, n: RunRows / 4)), baselineRunUsed: RunRows);

        var f = Assert.Single(findings, f => f.Kind == FindingKind.SampleShrank);
        Assert.Equal(0.25, f.Effect!.Value, 12);
        Assert.Contains("150 usable rows against 600 per run in the baseline", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Assess_WithoutPerRunSize_ComparesWithThePoolAsBefore()
    {
        var findings = Assess(Scenarios.Sample(Scenarios.Draw(seed: 40, n: RunRows)), baselineRunUsed: null);

        var f = Assert.Single(findings, f => f.Kind == FindingKind.SampleShrank);
        Assert.Equal(1.0 / PooledRuns, f.Effect!.Value, 12);
    }
}
