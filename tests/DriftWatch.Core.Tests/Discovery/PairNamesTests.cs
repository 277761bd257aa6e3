using System.Text.RegularExpressions;
using DriftWatch.Core.Discovery;

namespace DriftWatch.Core.Tests.Discovery;

public sealed class PairNamesTests
{
    // The configuration's rule for names (src/DriftWatch/Configuration/Identifiers.cs, CheckName); DriftWatch.Tests checks the real loader takes them.
    private static readonly Regex Rule = new(@"^[A-Za-z0-9][A-Za-z0-9_.\-]{0,99}$", RegexOptions.CultureInvariant);

    [Theory]
    [InlineData("orders", "net", "total", "orders.total_vs_net")]
    [InlineData("sales.orders", "net", "total", "sales.orders.total_vs_net")]
    [InlineData("_staging", "a$b", "c", "p_staging.c_vs_a_b")]
    public void For_PlainNames_ReadsTableDotYVsX(string table, string x, string y, string expected)
    {
        var name = PairNames.For(table, x, y, new HashSet<string>());
        Assert.Equal(expected, name);
        Assert.Matches(Rule, name);
    }

    [Fact]
    public void For_TakenAndLongNames_StayUniqueAndWithinTheLimit()
    {
        var taken = new HashSet<string> { "orders.total_vs_net" };
        Assert.Equal("orders.total_vs_net-2", PairNames.For("orders", "net", "total", taken));
        Assert.Equal("orders.total_vs_net-3", PairNames.For("orders", "net", "total", taken));

        var column = new string('c', 63);
        var first = PairNames.For("t", column, column + "y", taken);
        var second = PairNames.For("t", column, column + "y", taken);
        Assert.Equal(PairNames.MaxLength, first.Length);
        Assert.NotEqual(first, second);
        Assert.Matches(Rule, first);
        Assert.Matches(Rule, second);
    }
}
