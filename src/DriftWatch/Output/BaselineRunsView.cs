using System.Globalization;
using DriftWatch.Core.Baselines;
using DriftWatch.Core.History;
using Spectre.Console;

namespace DriftWatch.Output;

/// <summary>
/// The runs a baseline pooled, one row each with the figures a check is compared with, and the spread between
/// them (their standard deviation): the normal range a new run is judged against, not one pooled sample.
/// </summary>
internal static class BaselineRunsView
{
    public static void Render(IAnsiConsole console, StoredBaseline baseline)
    {
        ArgumentNullException.ThrowIfNull(console);
        ArgumentNullException.ThrowIfNull(baseline);
        var runs = baseline.Runs;
        if (runs.Count == 0)
        {
            console.MarkupLine("[grey]This baseline was stored before runs' own figures were kept; the next check pools it again.[/]");
            return;
        }

        var table = new Table().Border(TableBorder.Rounded)
            .Title($"[bold]{runs.Count.ToString(CultureInfo.InvariantCulture)} pooled runs[/]: rows, r, slope from the exact aggregate where given");
        table.AddColumns("run", "started (UTC)", "rows", "sampled", "r", "slope", "resid. SD", "outliers");
        foreach (var r in runs)
        {
            table.AddRow(
                r.RunId.ToString(CultureInfo.InvariantCulture),
                r.StartedAt.UtcDateTime.ToString("MM-dd HH:mm", CultureInfo.InvariantCulture),
                Figures.Count(r.Rows),
                Figures.Count(r.SampleUsed),
                Figures.Number(r.R),
                Figures.Number(r.Slope),
                Figures.Number(r.ResidualSd),
                Figures.Percent(r.OutlierRate));
        }

        table.AddEmptyRow();
        table.AddRow(
            "[bold]mean[/]", string.Empty,
            Figures.Number(Mean(runs, r => r.Rows)), Figures.Number(Mean(runs, r => r.SampleUsed)),
            Figures.Number(Mean(runs, r => r.R)), Figures.Number(Mean(runs, r => r.Slope)), Figures.Number(Mean(runs, r => r.ResidualSd)),
            Figures.Percent(Mean(runs, r => r.OutlierRate)));
        table.AddRow(
            "[bold]spread (SD)[/]", string.Empty,
            Figures.Number(Sd(runs, r => r.Rows)), Figures.Number(Sd(runs, r => r.SampleUsed)),
            Figures.Number(Sd(runs, r => r.R)), Figures.Number(Sd(runs, r => r.Slope)), Figures.Number(Sd(runs, r => r.ResidualSd)),
            Figures.Percent(Sd(runs, r => r.OutlierRate)));
        console.Write(table);
    }

    private static double? Mean(IReadOnlyList<RunFigures> runs, Func<RunFigures, double?> figure) => RunFigures.Mean(runs, figure);

    private static double? Sd(IReadOnlyList<RunFigures> runs, Func<RunFigures, double?> figure) => RunFigures.Spread(runs, figure);
}
