using DriftWatch.Alerting.Digest;
using DriftWatch.Core.History;
using static DriftWatch.Tests.Alerting.AlertSamples;

namespace DriftWatch.Tests.Alerting;

/// <summary>
/// The mail's figure table against its plot: a pooled baseline's row count is one run's, the plot draws the points
/// of all its runs, so the table says "per run" and how many runs (the figures are Anscombe's set I, 1973).
/// </summary>
public sealed class DigestFiguresTests
{
    private static BaselineSummary Judged(int runs, double rows) =>
        new(At.AddDays(-5), At.AddDays(-5), At.AddDays(-1), runs, false, 0.816, 0.5, 3.0, 1.24, rows, 0.0);

    [Fact]
    public void PooledBaseline_SaysItsRowCountIsPerRun_AndHowManyRuns()
    {
        var context = Context() with { JudgedAgainst = Judged(5, 800) };

        var size = DigestFigures.Rows(context)[0];

        Assert.Equal(("rows in the window", "800 per run (5 runs)"), (size.Name, size.Baseline));
    }

    [Fact]
    public void SingleRunBaseline_ShowsThePlainCount()
    {
        var context = Context() with { JudgedAgainst = Judged(1, 800) };

        Assert.Equal("800", DigestFigures.Rows(context)[0].Baseline);
    }

    [Fact]
    public void WithoutARecordedBaseline_TheSampleSizeRowIsUnchanged()
    {
        var size = DigestFigures.Rows(Context())[0];

        Assert.Equal(("rows used (n)", "11", "11"), (size.Name, size.Baseline, size.Current));
    }
}
