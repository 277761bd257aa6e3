using System.Globalization;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Statistics;

/// <summary>
/// The search for a partly derived line finds its candidates' keys without formatting most of them (see
/// <c>DerivedRows.MostFrequent</c>). Reference: the plain definition it must equal, written out here: every
/// neighbouring pair's slope and intercept formatted "G9", counted by that text, the most frequent key winning and
/// the first key seen breaking ties. Compared bit for bit on generated data of the kinds that stress the keys:
/// values rounded to cents (many coincidentally equal slopes), small integers, exact lines through part of the rows,
/// lines through the origin (intercepts of ±0), and magnitudes from 1e-12 to 1e12.
/// </summary>
public sealed class DerivedRowsTests
{
    public static TheoryData<string, int> Cases()
    {
        var data = new TheoryData<string, int>();
        foreach (var kind in new[] { "cents", "integers", "partial-line", "origin-line", "magnitudes", "steps" })
        {
            for (var seed = 1; seed <= 25; seed++)
            {
                data.Add(kind, seed);
            }
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Of_EqualsThePlainDefinition_BitForBit(string kind, int seed)
    {
        var (x, y) = Generate(kind, seed);
        var tolerance = 1e-9 * StandardDeviation(y);

        var fast = DerivedRows.Of(x, y, tolerance);
        var plain = PlainOf(x, y, tolerance);

        Assert.Equal(plain.HasValue, fast.HasValue);
        if (plain is { } p && fast is { } f)
        {
            Assert.Equal(BitConverter.DoubleToInt64Bits(p.Share), BitConverter.DoubleToInt64Bits(f.Share));
            Assert.Equal(BitConverter.DoubleToInt64Bits(p.Slope), BitConverter.DoubleToInt64Bits(f.Slope));
            Assert.Equal(BitConverter.DoubleToInt64Bits(p.Intercept), BitConverter.DoubleToInt64Bits(f.Intercept));
        }
    }

    [Fact]
    public void Of_HalfTheRowsOnAnExactLine_FindsThatLineAndAboutHalfTheRows()
    {
        // y = 4.5 + 2.2·x on the even rows (a derived column on one source system's rows), noise elsewhere.
        var random = new Random(5);
        var x = Enumerable.Range(0, 2000).Select(_ => Math.Round(random.NextDouble() * 100, 2)).ToArray();
        var y = x.Select((v, i) => i % 2 == 0 ? 4.5 + (2.2 * v) : Math.Round((2 * v) + (random.NextDouble() * 40), 2)).ToArray();

        var found = DerivedRows.Of(x, y, 1e-9 * StandardDeviation(y))!.Value;

        Assert.Equal(2.2, found.Slope, 9);
        Assert.Equal(4.5, found.Intercept, 7);
        Assert.InRange(found.Share, 0.5, 0.52);
    }

    private static (double[] X, double[] Y) Generate(string kind, int seed)
    {
        var random = new Random(seed);
        var n = 10 + random.Next(3000);
        var x = new double[n];
        var y = new double[n];
        for (var i = 0; i < n; i++)
        {
            switch (kind)
            {
                case "cents":
                    x[i] = Math.Round(50 + (10 * Gaussian(random)), 2);
                    y[i] = Math.Round(10 + (2 * x[i]) + (20 * Gaussian(random)), 2);
                    break;
                case "integers":
                    x[i] = random.Next(1, 12);
                    y[i] = random.Next(0, 30);
                    break;
                case "partial-line":
                    x[i] = Math.Round(random.NextDouble() * 1000, 3);
                    y[i] = random.Next(3) == 0 ? -7.25 + (0.37 * x[i]) : Math.Round((0.4 * x[i]) + (50 * random.NextDouble()), 2);
                    break;
                case "origin-line":
                    x[i] = Math.Round((random.NextDouble() - 0.5) * 200, 1);
                    y[i] = random.Next(2) == 0 ? 3 * x[i] : Math.Round(random.NextDouble() * 100, 1);
                    break;
                case "magnitudes":
                    var scale = Math.Pow(10, random.Next(-12, 13));
                    x[i] = random.NextDouble() * scale;
                    y[i] = random.Next(2) == 0 ? (1e-3 + (5 * x[i])) * scale : random.NextDouble() * scale;
                    break;
                default:
                    // Steps: few distinct x, y on two interleaved lines.
                    x[i] = random.Next(0, 40) * 0.25;
                    y[i] = random.Next(2) == 0 ? 1 + x[i] : 1.000000001 + (1.000000001 * x[i]);
                    break;
            }
        }

        return (x, y);
    }

    /// <summary>The plain definition: every candidate key formatted and counted (insertion order breaks ties).</summary>
    private static (double Share, double Slope, double Intercept)? PlainOf(double[] x, double[] y, double tolerance)
    {
        int n = x.Length;
        if (n < 10)
        {
            return null;
        }

        var order = Enumerable.Range(0, n).ToArray();
        var keys = (double[])x.Clone();
        Array.Sort(keys, order);
        var votes = new Dictionary<(string, string), (int Count, double Slope, double Intercept)>();
        for (int k = 1; k < n; k++)
        {
            int i = order[k - 1], j = order[k];
            double dx = x[j] - x[i];
            if (!(dx > 0))
            {
                continue;
            }

            double b = (y[j] - y[i]) / dx;
            double a = y[i] - (b * x[i]);
            if (!double.IsFinite(a) || !double.IsFinite(b) || b == 0)
            {
                continue;
            }

            var key = (b.ToString("G9", CultureInfo.InvariantCulture), a.ToString("G9", CultureInfo.InvariantCulture));
            votes[key] = votes.TryGetValue(key, out var v) ? (v.Count + 1, v.Slope, v.Intercept) : (1, b, a);
        }

        if (votes.Count == 0)
        {
            return (0, 0, 0);
        }

        var best = votes.Values.MaxBy(v => v.Count);
        if (best.Count < 3)
        {
            return (0, best.Slope, best.Intercept);
        }

        int on = 0;
        for (int i = 0; i < n; i++)
        {
            double scale = tolerance + (16 * double.Epsilon) + (16 * Math.ScaleB(1.0, -52) * (Math.Abs(y[i]) + Math.Abs(best.Slope * x[i])));
            if (Math.Abs(y[i] - (best.Intercept + (best.Slope * x[i]))) <= scale)
            {
                on++;
            }
        }

        return ((double)on / n, best.Slope, best.Intercept);
    }

    private static double Gaussian(Random random) =>
        Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());

    private static double StandardDeviation(double[] v)
    {
        var mean = v.Average();
        return Math.Sqrt(v.Sum(e => (e - mean) * (e - mean)) / (v.Length - 1));
    }
}
