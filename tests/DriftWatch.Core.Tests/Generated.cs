using MathNet.Numerics.Distributions;

namespace DriftWatch.Core.Tests;

/// <summary>Seeded random test data (property and scenario checks), never demo data.</summary>
internal static class Generated
{
    public static double[] Normal(Random random, int n, double mean = 0, double sd = 1)
    {
        var values = new double[n];
        for (int i = 0; i < n; i++)
        {
            values[i] = MathNet.Numerics.Distributions.Normal.Sample(random, mean, sd);
        }

        return values;
    }

    public static double[] Uniform(Random random, int n, double low, double high)
    {
        var values = new double[n];
        for (int i = 0; i < n; i++)
        {
            values[i] = ContinuousUniform.Sample(random, low, high);
        }

        return values;
    }

    /// <summary>y = intercept + slope·x + N(0, noise²).</summary>
    public static double[] Line(Random random, double[] x, double intercept, double slope, double noise) =>
        [.. x.Select(v => intercept + (slope * v) + MathNet.Numerics.Distributions.Normal.Sample(random, 0, noise))];

    /// <summary>Integers 0..levels−1: a column with many ties.</summary>
    public static double[] Levels(Random random, int n, int levels) =>
        [.. Enumerable.Range(0, n).Select(_ => (double)random.Next(levels))];
}
