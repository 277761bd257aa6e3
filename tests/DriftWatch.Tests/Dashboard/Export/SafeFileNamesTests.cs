using DriftWatch.Dashboard.Export;

namespace DriftWatch.Tests.Dashboard.Export;

public sealed class SafeFileNamesTests
{
    [Fact]
    public void For_PlainNames_StayAsTheyAre()
    {
        var files = SafeFileNames.For(["orders.total_vs_items", "fleet-fuel"]);

        Assert.Equal("orders.total_vs_items.html", files["orders.total_vs_items"]);
        Assert.Equal("fleet-fuel.html", files["fleet-fuel"]);
    }

    [Fact]
    public void For_HostileAndCollidingNames_GetDistinctSafeFiles()
    {
        string[] names = ["<script>alert(1)</script>", "../../etc/passwd", "Orders", "orders", "a/b", "a_b", new string('x', 300)];

        var files = SafeFileNames.For(names);

        Assert.Equal(names.Length, files.Values.Distinct(StringComparer.OrdinalIgnoreCase).Count());
        Assert.All(files.Values, f => Assert.Matches("^[a-z0-9_][a-z0-9._-]{0,100}\\.html$", f));
        Assert.All(files.Values, f => Assert.DoesNotContain("..", f, StringComparison.Ordinal));
    }
}
