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
                Readable.Count(r.Rows),
                Readable.Count(r.SampleUsed),
                Readable.Number(r.R),
                Readable.Number(r.Slope),
                Readable.Number(r.ResidualSd),
                Readable.Percent(r.OutlierRate));
        }

        table.AddEmptyRow();
        table.AddRow(
            "[bold]mean[/]", string.Empty,
            Readable.Number(Mean(runs, r => r.Rows)), Readable.Number(Mean(runs, r => r.SampleUsed)),
            Readable.Number(Mean(runs, r => r.R)), Readable.Number(Mean(runs, r => r.Slope)), Readable.Number(Mean(runs, r => r.ResidualSd)),
            Readable.Percent(Mean(runs, r => r.OutlierRate)));
        table.AddRow(
            "[bold]spread (SD)[/]", string.Empty,
            Readable.Number(Sd(runs, r => r.Rows)), Readable.Number(Sd(runs, r => r.SampleUsed)),
            Readable.Number(Sd(runs, r => r.R)), Readable.Number(Sd(runs, r => r.Slope)), Readable.Number(Sd(runs, r => r.ResidualSd)),
            Readable.Percent(Sd(runs, r => r.OutlierRate)));
        console.Write(table);
    }

    private static double? Mean(IReadOnlyList<RunFigures> runs, Func<RunFigures, double?> figure) => RunFigures.Mean(runs, figure);

    private static double? Sd(IReadOnlyList<RunFigures> runs, Func<RunFigures, double?> figure) => RunFigures.Spread(runs, figure);
}
