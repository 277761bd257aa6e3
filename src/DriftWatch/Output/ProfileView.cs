using DriftWatch.Core.Profiling;
using Spectre.Console;

namespace DriftWatch.Output;

/// <summary>
/// The human report of <c>profile</c>: which inputs, one table of figures (current beside baseline when
/// comparing) in sections, then the findings and the caution line.
/// </summary>
internal static class ProfileView
{
    private sealed record Row(string Label, Func<RelationshipProfile, string> Value);

    private sealed record Section(string Title, IReadOnlyList<Row> Rows);

    private static readonly Section[] Sections =
    [
        new("Rows",
        [
            new("rows read", p => Figures.Count(p.NRows)),
            new("used", p => Figures.Count(p.NUsed)),
            new("empty (null)", p => Figures.Count(p.NNull)),
            new("NaN or infinite", p => Figures.Count(p.NNonfinite)),
            new("not a number", p => Figures.Count(p.NNonNumeric)),
            new("distinct x / y", p => $"{Figures.Count(p.DistinctX)} / {Figures.Count(p.DistinctY)}"),
        ]),
        new("Columns",
        [
            new("x mean ± sd", p => Readable.WithSpread(p.XMean, p.XSd)),
            new("y mean ± sd", p => Readable.WithSpread(p.YMean, p.YSd)),
        ]),
        new("Correlation",
        [
            new("Pearson r [CI]", p => Readable.WithInterval(p.PearsonR, p.PearsonCiLow, p.PearsonCiHigh)),
            new("Pearson p", p => Figures.PValue(p.PearsonP)),
            new("Spearman rho", p => Figures.Number(p.SpearmanRho)),
            new("Kendall tau-b", p => Figures.Number(p.KendallTauB)),
        ]),
        new("Least-squares line",
        [
            new("equation", p => p.Equation ?? Figures.Missing),
            new("slope ± se", p => Readable.WithSpread(p.Slope, p.SlopeSe)),
            new("intercept ± se", p => Readable.WithSpread(p.Intercept, p.InterceptSe)),
            new("R squared", p => Figures.Number(p.RSquared)),
            new("residual sd", p => Figures.Number(p.ResidualSd)),
        ]),
        new("Shape",
        [
            new("shape", p => JsonContract.Name(p.Shape)),
            new("quadratic term (p)", p => Readable.WithNote(Figures.Number(p.QuadraticCoef), p.QuadraticP is null ? null : "p " + Figures.PValue(p.QuadraticP))),
            new("R squared gain of curve", p => Figures.Number(p.QuadraticR2Gain)),
            new("outliers", p => Readable.WithNote(Figures.Count(p.OutlierCount), p.OutlierRate is null ? null : Figures.Percent(p.OutlierRate))),
            new("max Cook's distance", p => Figures.Number(p.MaxCooksDistance)),
            new("points over Cook's limit", p => Figures.Count(p.CooksOverThreshold)),
            new("max leverage", p => Figures.Number(p.MaxLeverage)),
            new("r without top influence", p => Figures.Number(p.PearsonRWithoutTopInfluence)),
        ]),
        new("Exactness",
        [
            new("y = a + b x exactly", p => Readable.YesNo(p.ExactAffine)),
            new("y = x exactly", p => Readable.YesNo(p.ExactIdentity)),
            new("exactly monotone", p => Readable.YesNo(p.ExactMonotone)),
        ]),
    ];

    public static void Render(IAnsiConsole console, ProfileReport report)
    {
        ArgumentNullException.ThrowIfNull(console);
        ArgumentNullException.ThrowIfNull(report);

        var labels = report.Labels;
        console.MarkupLine($"[bold]{Markup.Escape(labels.YName)}[/] against [bold]{Markup.Escape(labels.XName)}[/]");
        console.MarkupLine($"  {Markup.Escape(labels.CurrentWord)}:  {Markup.Escape(labels.CurrentSource)}");
        if (labels.BaselineSource is not null)
        {
            console.MarkupLine($"  baseline: {Markup.Escape(labels.BaselineSource)}");
        }

        console.WriteLine();
        console.Write(BuildTable(report));
        // The shape's reason is a sentence: below the table it reads as one, inside a cell it would not.
        // A pooled baseline (baseline show) is not an extract: say what it is.
        WriteShapeReason(console, labels.CurrentWord == "current" ? "current extract" : "pooled " + labels.CurrentWord, report.Current);
        if (report.Baseline is not null)
        {
            WriteShapeReason(console, "baseline extract", report.Baseline);
        }

        console.WriteLine();
        if (report.Unmeasurable is { } reason)
        {
            console.MarkupLine($"[red]unmeasurable[/]: {Markup.Escape(reason)} Nothing was compared.");
            return;
        }

        FindingsView.Render(console, report.Findings);
    }

    private static void WriteShapeReason(IAnsiConsole console, string which, RelationshipProfile profile)
    {
        if (profile.ShapeReason is { Length: > 0 } reason)
        {
            console.MarkupLine($"[bold]Shape of the {Markup.Escape(which)}: {JsonContract.Name(profile.Shape)}.[/] {Markup.Escape(reason)}");
        }
    }

    private static Table BuildTable(ProfileReport report)
    {
        var profiles = report.Baseline is null ? [report.Current] : new[] { report.Current, report.Baseline };
        var table = new Table().Border(TableBorder.Rounded).AddColumn(new TableColumn(string.Empty).NoWrap());
        table.AddColumn(new TableColumn($"[bold]{Markup.Escape(report.Labels.CurrentWord)}[/]").RightAligned());
        if (report.Baseline is not null)
        {
            table.AddColumn(new TableColumn("[bold]baseline[/]").RightAligned());
        }

        foreach (var section in Sections)
        {
            if (table.Rows.Count > 0)
            {
                table.AddEmptyRow();
            }

            table.AddRow([new Markup($"[bold underline]{Markup.Escape(section.Title)}[/]"), .. profiles.Select(_ => Text.Empty)]);
            foreach (var row in section.Rows)
            {
                table.AddRow([new Text("  " + row.Label), .. profiles.Select(p => new Text(row.Value(p)))]);
            }
        }

        return table;
    }
}
