using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Findings;

/// <summary>
/// The exact whole-window line against the sample's. The window's exact figures are computed by the engine's
/// own profile of every row (its Pearson and least-squares figures are checked against NIST StRD Norris and
/// MathNet elsewhere); the sample is a seeded subset (test data).
/// </summary>
public sealed class SampleAgreementTests
{
    private static (double[] X, double[] Y) Window(int n, int seed)
    {
        var random = new Random(seed);
        var x = Generated.Normal(random, n, 50, 10);
        return (x, Generated.Line(random, x, 10, 2, 20));
    }

    private static SourceFigures ExactOf(double[] x, double[] y)
    {
        var p = Profiler.Profile(new PairedSample(x, y), Thresholds.Default);
        return new SourceFigures(x.Length, x.Length, 0, p.PearsonR, p.Slope, p.Intercept, p.XMean, p.YMean, p.XSd * p.XSd, p.YSd * p.YSd);
    }

    [Fact]
    public void Assess_OneTotalRowOutsideTheSample_IsHiddenRowsDriveLine()
    {
        var (x, y) = Window(60_000, 1);

        // A total row loaded among the detail rows: the column sums.
        double[] wx = [.. x, x.Sum()], wy = [.. y, y.Sum()];
        var sample = new PairedSample(x[..10_000], y[..10_000]);
        var profile = Profiler.Profile(sample, Thresholds.Default);

        var findings = FindingEngine.Assess(profile, sample, ExactOf(wx, wy), (StoredBaseline?)null, PairDeclaration.None, Thresholds.Default);

        var f = Assert.Single(findings, f => f.Kind == FindingKind.HiddenRowsDriveLine);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.Contains("60,001 rows", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Assess_ARandomSampleOfAnOrdinaryWindow_AgreesWithTheExactLine()
    {
        var (x, y) = Window(60_000, 2);
        var random = new Random(3);
        var pick = Enumerable.Range(0, x.Length).OrderBy(_ => random.Next()).Take(10_000).ToArray();
        var sample = new PairedSample([.. pick.Select(i => x[i])], [.. pick.Select(i => y[i])]);
        var profile = Profiler.Profile(sample, Thresholds.Default);

        Assert.False(SampleAgreement.Test(profile, ExactOf(x, y), Thresholds.Default)!.Disagrees);
        Assert.DoesNotContain(
            FindingEngine.Assess(profile, sample, ExactOf(x, y), (StoredBaseline?)null, PairDeclaration.None, Thresholds.Default),
            f => f.Kind == FindingKind.HiddenRowsDriveLine);
    }

    [Fact]
    public void Test_TheSampleIsTheWholeWindow_HasNothingToCompare()
    {
        var (x, y) = Window(2_000, 4);
        var profile = Profiler.Profile(new PairedSample(x, y), Thresholds.Default);

        Assert.Null(SampleAgreement.Test(profile, ExactOf(x, y), Thresholds.Default));
    }
}
