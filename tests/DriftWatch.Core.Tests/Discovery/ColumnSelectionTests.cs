using DriftWatch.Core.Discovery;

namespace DriftWatch.Core.Tests.Discovery;

public sealed class ColumnSelectionTests
{
    [Fact]
    public void Choose_MoreColumnsThanTheBound_KeepsCatalogueOrderAndSaysHowManyWereSkipped()
    {
        var columns = Enumerable.Range(1, 14).Select(i => new CatalogueColumn($"c{i}", "float8", Numeric: i != 3)).ToList();
        var selection = ColumnSelection.Choose(columns, 10);

        Assert.Equal(["c1", "c2", "c4", "c5", "c6", "c7", "c8", "c9", "c10", "c11"], selection.Chosen);
        Assert.Equal(["c12", "c13", "c14"], selection.Skipped);
        Assert.Equal("c3", Assert.Single(selection.NonNumeric).Name);
        var message = selection.SkippedMessage(10)!;
        Assert.Contains("13 numeric columns", message, StringComparison.Ordinal);
        Assert.Contains("Skipped 3: c12, c13, c14", message, StringComparison.Ordinal);
        Assert.Contains("--max-columns 10", message, StringComparison.Ordinal);
        Assert.Null(ColumnSelection.Choose(columns, 60).SkippedMessage(60));
    }
}
