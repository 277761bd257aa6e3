using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Statistics;

public sealed class RadixSortTests
{
    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    public void Sort_MixedSignsMagnitudesAndZeros_OrdersLikeArraySort(int seed)
    {
        var random = new Random(seed);
        var values = Enumerable.Range(0, 5000).Select(_ => random.Next(6) switch
        {
            0 => 0.0,
            1 => -0.0,
            2 => (random.NextDouble() - 0.5) * 1e300,
            3 => (random.NextDouble() - 0.5) * 1e-300,
            4 => Math.Round(random.NextDouble() * 10),
            _ => -random.NextDouble(),
        }).Append(double.MaxValue).Append(-double.MaxValue).Append(double.Epsilon).ToArray();

        var (keys, rows) = RadixSort.Sort(values);

        // Array.Sort (the framework's comparison sort) as oracle for the order.
        var expected = (double[])values.Clone();
        Array.Sort(expected);
        Assert.Equal(expected, rows.Select(i => values[i]).ToArray());
        Assert.Equal(rows.Length, rows.Distinct().Count());
        for (int i = 1; i < keys.Length; i++)
        {
            Assert.True(keys[i - 1] <= keys[i]);
            Assert.Equal(values[rows[i - 1]] == values[rows[i]], keys[i - 1] == keys[i]);
        }
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    public void SortKeys_MixedValues_AreTheKeysOfArraySortsOrder(int seed)
    {
        var random = new Random(seed);
        var values = Enumerable.Range(0, 3000).Select(_ => random.Next(4) switch
        {
            0 => -0.0,
            1 => (random.NextDouble() - 0.5) * 1e200,
            2 => Math.Round(random.NextDouble() * 5),
            _ => -random.NextDouble(),
        }).ToArray();
        var expected = (double[])values.Clone();
        Array.Sort(expected);

        Assert.Equal(expected.Select(RadixSort.Key), RadixSort.SortKeys(values));
    }

    [Fact]
    public void Sort_Empty_ReturnsEmpty()
    {
        var (keys, rows) = RadixSort.Sort([]);

        Assert.Empty(keys);
        Assert.Empty(rows);
    }
}
