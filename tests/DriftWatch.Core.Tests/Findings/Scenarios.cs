using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Findings;

/// <summary>
/// Seeded scenarios for the comparison rules: a baseline draw of y = 10 + 2x + N(0, 20²) with
/// x ~ N(50, 10²) (r ≈ 0.71), and current draws changed in one way each.
/// </summary>
internal static class Scenarios
{
    public const int N = 2000;

    public static (double[] X, double[] Y) Draw(int seed, int n = N, double xMean = 50, double slope = 2, double intercept = 10, double noise = 20)
    {
        var random = new Random(seed);
        var x = Generated.Normal(random, n, xMean, 10);
        return (x, Generated.Line(random, x, intercept, slope, noise));
    }

    public static PairedSample Sample((double[] X, double[] Y) draw, int nulls = 0) => new(draw.X, draw.Y, nulls);

    public static RelationshipProfile Profile(PairedSample sample) => Profiler.Profile(sample, Thresholds.Default);
}
