using DriftWatch.Core.Configuration;
using DriftWatch.Sources;

namespace DriftWatch.IntegrationTests.Sources;

public sealed class SamplePlannerTests
{
    private static readonly SampleSpec Auto = new() { Rows = 10_000 };

    [Theory]
    [InlineData(8_000)]
    [InlineData(49_999)]
    public void Auto_SmallWindow_ReadsAll(long windowRows)
    {
        Assert.Equal(SampleDraw.All, SamplePlanner.Choose(Auto, windowRows, 1e6, filtered: false).Draw);
    }

    [Fact]
    public void Auto_LargeUnfilteredTable_TableSamplesOneAndAHalfTimesTheRows()
    {
        var plan = SamplePlanner.Choose(Auto, 1_000_000, 1_000_000, filtered: false);

        Assert.Equal(SampleDraw.Tablesample, plan.Draw);
        Assert.Equal(1.5, plan.Percent!.Value, 12);
    }

    [Fact]
    public void Auto_NeverAnalysedTable_UsesTheExactCountWhenUnfiltered_RandomWhenFiltered()
    {
        // pg_class.reltuples is -1 for a table never vacuumed or analysed (PostgreSQL 14+ catalog docs).
        Assert.Equal(SampleDraw.Tablesample, SamplePlanner.Choose(Auto, 1_000_000, -1, filtered: false).Draw);
        Assert.Equal(SampleDraw.Random, SamplePlanner.Choose(Auto, 1_000_000, -1, filtered: true).Draw);
    }

    [Fact]
    public void Auto_SmallWindowOfAHugeTable_PrefersRandomOverReadingMuchOfTheTable()
    {
        // 15 % of a 10M-row table is 1.5M rows; the window holds only 100 000.
        Assert.Equal(SampleDraw.Random, SamplePlanner.Choose(Auto, 100_000, 10_000_000, filtered: true).Draw);
    }

    [Fact]
    public void Percent_IsCappedAtAHundred()
    {
        var plan = SamplePlanner.Choose(new SampleSpec { Rows = 10_000, Method = SampleMethod.Tablesample }, 12_000, 12_000, filtered: false);

        Assert.Equal(100, plan.Percent);
    }

    [Fact]
    public void ExplicitMethods_AreHonoured_ExceptWhereImpossible()
    {
        Assert.Equal(SampleDraw.All, SamplePlanner.Choose(Auto with { Method = SampleMethod.All }, 5_000_000, 5e6, false).Draw);
        Assert.Equal(SampleDraw.Random, SamplePlanner.Choose(Auto with { Method = SampleMethod.Random }, 5_000_000, 5e6, false).Draw);
        Assert.Equal(SampleDraw.Tablesample, SamplePlanner.Choose(Auto with { Method = SampleMethod.Tablesample }, 5_000_000, 5e6, true).Draw);
        var view = SamplePlanner.Choose(Auto with { Method = SampleMethod.Tablesample }, 5_000_000, null, false);
        Assert.Equal(SampleDraw.Random, view.Draw);
        Assert.NotNull(view.Note);
    }

    [Fact]
    public void RandomDraws_KeepAboutRowsPlusSixRootRowsPlus100_OnlyWhenThatIsAtMostHalfTheWindow()
    {
        // 10,000 of a 86,400-row window (one day of one row per second): keep (10,000 + 600 + 100) / 86,400.
        Assert.Equal(10_700.0 / 86_400, SamplePlanner.KeepFor(10_000, 86_400)!.Value, 15);
        Assert.Null(SamplePlanner.KeepFor(10_000, 20_000));
        Assert.Equal(10_700.0 / 100_000, SamplePlanner.Choose(Auto, 100_000, 10_000_000, filtered: true).Keep!.Value, 15);
        Assert.NotNull(SamplePlanner.Choose(Auto with { Method = SampleMethod.Random }, 5_000_000, 5e6, false).Keep);
        // Not for the other draws.
        Assert.Null(SamplePlanner.Choose(Auto, 1_000_000, 1_000_000, filtered: false).Keep);
        Assert.Null(SamplePlanner.Choose(Auto, 8_000, 1e6, filtered: false).Keep);
    }
}
