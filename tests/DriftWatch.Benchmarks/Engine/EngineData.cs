using DriftWatch.Core.Profiling;
using MathNet.Numerics.Distributions;

namespace DriftWatch.Benchmarks.Engine;

/// <summary>Seeded synthetic pairs for the benchmarks: y = 10 + 2x + noise with a few ties and outliers.</summary>
internal static class EngineData
{
    public static PairedSample Pair(int n, int seed, double slope = 2)
    {
        var random = new Random(seed);
        var x = new double[n];
        var y = new double[n];
        for (int i = 0; i < n; i++)
        {
            // Rounded to cents, as money and weights are stored: real columns have ties.
            x[i] = Math.Round(Normal.Sample(random, 50, 10), 2);
            y[i] = Math.Round(10 + (slope * x[i]) + Normal.Sample(random, 0, 20), 2);
            if (i % 997 == 0)
            {
                y[i] += 300;
            }
        }

        return new PairedSample(x, y, nullCount: n / 100);
    }
}
