using System.Text.Json;
using DriftWatch.Core.Discovery;
using DriftWatch.Output;
using DriftWatch.Sources;
using Spectre.Console;

namespace DriftWatch.Cli;

/// <summary>What <c>discover</c> prints for people (tables) and for scripts (JSON with the YAML block in it).</summary>
internal static class DiscoverView
{
    public static void WriteTables(CliConsole console, string source, TableSurvey survey, DiscoveryResult result)
    {
        var columns = survey.Stats.Count;
        var rows = columns == 0 ? 0 : survey.Stats[0].Rows;
        console.Ansi.MarkupLine(Markup.Escape(
            $"Table {survey.Table} (source '{source}'): {columns} numeric columns, {columns * (columns - 1) / 2} pairs, correlations over {Figures.Count(rows)} rows; " +
            $"shared sample: {survey.Sample.Method} rows; {result.ProfiledPairs} pairs profiled."));

        if (result.Derivations.Count > 0)
        {
            console.Ansi.WriteLine();
            console.Ansi.MarkupLine("[bold]Derived columns[/] (exact copies or functions of another column: usually a data smell, never a finding about the world)");
            var derived = new Table().Border(TableBorder.Rounded);
            derived.AddColumn("column").AddColumn("from").AddColumn("kind").AddColumn("equation").AddColumn(new TableColumn("r").RightAligned()).AddColumn(new TableColumn("n").RightAligned());
            foreach (var d in result.Derivations)
            {
                derived.AddRow(Markup.Escape(d.Column), Markup.Escape(d.From), JsonContract.Name(d.Kind), Markup.Escape(d.Equation), Figures.Correlation(d.R), Figures.Count(d.N));
            }

            console.Ansi.Write(derived);
        }

        console.Ansi.WriteLine();
        if (result.Candidates.Count == 0)
        {
            console.Ansi.MarkupLine("No other pair reached the bound on |r|.");
        }
        else
        {
            console.Ansi.MarkupLine("[bold]Candidate pairs[/] (r and n over the whole table; ρ and shape from the shared sample)");
            var candidates = new Table().Border(TableBorder.Rounded);
            candidates.AddColumn(new TableColumn("#").RightAligned()).AddColumn("x").AddColumn("y")
                .AddColumn(new TableColumn("r").RightAligned()).AddColumn(new TableColumn("ρ").RightAligned()).AddColumn(new TableColumn("n").RightAligned()).AddColumn("shape");
            var rank = 0;
            foreach (var c in result.Candidates)
            {
                candidates.AddRow((++rank).ToString(System.Globalization.CultureInfo.InvariantCulture), Markup.Escape(c.X), Markup.Escape(c.Y),
                    Figures.Correlation(c.R), Figures.Correlation(c.Spearman), Figures.Count(c.N), JsonContract.Name(c.Shape));
            }

            console.Ansi.Write(candidates);
        }

        console.Ansi.WriteLine();
        console.Ansi.MarkupLine(Markup.Escape("Correlations are statistical signals, not proof. --format yaml prints these as pairs: entries; --write FILE appends them to a file."));
    }

    public static void WriteJson(CliConsole console, string source, TableSurvey survey, DiscoveryResult result, string yaml)
    {
        var json = new DiscoverJson(
            source,
            survey.Table.ToString(),
            survey.Stats.Count == 0 ? 0 : survey.Stats[0].Rows,
            [.. survey.Selection.Chosen],
            [.. survey.Selection.Skipped],
            [.. survey.Selection.NonNumeric.Select(c => c.Name)],
            survey.Sample.Method,
            [.. result.Derivations.Select(d => new DerivationJson(d.Column, d.From, JsonContract.Name(d.Kind), d.Equation, Finite(d.R), d.N, Finite(d.Slope), Finite(d.Intercept)))],
            [.. result.Candidates.Select(c => new CandidateJson(c.X, c.Y, c.R, c.N, Finite(c.Spearman), JsonContract.Name(c.Shape), c.ShapeReason, c.SampleRows, Finite(c.DerivedShare)))],
            yaml);
        console.Out.WriteLine(JsonSerializer.Serialize(json, JsonContract.Options));
    }

    private static double? Finite(double? value) => value is { } v && double.IsFinite(v) ? v : null;

    private sealed record DiscoverJson(
        string Source,
        string Table,
        long Rows,
        string[] Columns,
        string[] SkippedColumns,
        string[] NonNumericColumns,
        string SampleMethod,
        DerivationJson[] Derivations,
        CandidateJson[] Candidates,
        string Yaml);

    private sealed record DerivationJson(string Column, string From, string Kind, string Equation, double? R, long N, double? Slope, double? Intercept);

    private sealed record CandidateJson(string X, string Y, double R, long N, double? Spearman, string Shape, string? ShapeReason, int SampleRows, double? DerivedShare);
}
