using System.Text.Json.Serialization;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Monitoring;
using DriftWatch.Output;
using Spectre.Console;

namespace DriftWatch.Cli;

/// <summary>What <c>check</c> prints: a table for people, or JSON for a pipeline step.</summary>
internal static class CheckOutput
{
    public static void RenderTable(IAnsiConsole console, IReadOnlyList<PairCheckResult> results)
    {
        var table = new Table().Border(TableBorder.Rounded).Title("[bold]DriftWatch check[/]");
        table.AddColumns("pair", "status", "n", "r", "ρ", "slope", "shape", "worst finding");
        foreach (var r in results.OrderByDescending(r => r.Status != RunStatus.Succeeded).ThenByDescending(r => r.WorstSeverity ?? (Severity)(-1)))
        {
            var p = r.Profile;
            var worst = r.Findings.OrderByDescending(f => f.Severity).FirstOrDefault();
            table.AddRow(
                Markup.Escape(r.Pair.Name),
                StatusMarkup(r),
                Figures.Count(p?.NUsed),
                Figures.Number(p?.PearsonR),
                Figures.Number(p?.SpearmanRho),
                Figures.Number(p?.Slope),
                p is null ? "" : JsonContract.Name(p.Shape),
                worst is null ? r.Status switch
                {
                    RunStatus.Failed => "[red]check failed[/]",
                    RunStatus.Unmeasurable => "[red]nothing measured[/]",
                    RunStatus.Interrupted => "[red]cut off[/]",
                    _ => "[green]none[/]",
                } : SeverityStyle.Markup(worst.Severity) + " " + Markup.Escape(JsonContract.Name(worst.Kind)));
        }

        console.Write(table);
        foreach (var r in results.Where(r => r.RepeatOf is not null))
        {
            console.MarkupLine(
                $"[grey]repeat[/] [bold]{Markup.Escape(r.Pair.Name)}[/]: same load as run {r.RepeatOf} (window ended at {Markup.Escape(EndText(r.WindowEnd))}); nothing new recorded");
        }

        foreach (var r in results.Where(r => r.BackDated && r.RepeatOf is null))
        {
            console.MarkupLine(
                $"[grey]back-dated[/] [bold]{Markup.Escape(r.Pair.Name)}[/]: recorded as of {Markup.Escape(Figures.Time(r.StartedAt))}, window ended at {Markup.Escape(EndText(r.WindowEnd))}; no alert is raised or mailed for it");
        }

        foreach (var r in results.Where(r => r.Error is not null))
        {
            console.MarkupLine($"{StatusMarkup(r)} [bold]{Markup.Escape(r.Pair.Name)}[/]: {Markup.Escape(r.Error!)}");
        }

        foreach (var r in results.Where(r => r.Findings.Count > 0))
        {
            console.MarkupLine($"[bold]{Markup.Escape(r.Pair.Name)}[/] ({Markup.Escape(r.Pair.X)} vs {Markup.Escape(r.Pair.Y)})");
            FindingsView.Render(console, r.Findings);
        }
    }

    /// <summary>The run's status word as JSON and history print it; "(no baseline yet)" while there is nothing to compare with.</summary>
    private static string StatusMarkup(PairCheckResult r) =>
        r.Status != RunStatus.Succeeded || r.HasBaseline
            ? RunStatusText.Markup(r.Status)
            : RunStatusText.Markup(r.Status) + " [grey](no baseline yet)[/]";

    private static string EndText(DateTimeOffset? end) => end is { } e ? Figures.Time(e) : "— (no value of the window column)";

    public static CheckReportJson ToJson(IReadOnlyList<PairCheckResult> results, int exitCode) => new(
        exitCode,
        [.. results.Select(r => new CheckPairJson(
            r.Pair.Name,
            r.Pair.Source,
            JsonContract.Name(r.Status),
            r.Error,
            r.RunId == 0 ? null : r.RunId,
            r.StartedAt,
            r.HasBaseline,
            r.Profile is null ? null : JsonContract.ToJson(r.Profile),
            [.. r.Findings.Select(JsonContract.ToJson)],
            WindowJson.Of(r.Window),
            JudgedAgainstJson.Of(r.JudgedAgainst),
            r.WindowEnd,
            r.BackDated,
            r.RepeatOf))]);
}

internal sealed record CheckReportJson(
    [property: JsonPropertyName("exit_code")] int ExitCode,
    [property: JsonPropertyName("pairs")] IReadOnlyList<CheckPairJson> Pairs);

internal sealed record CheckPairJson(
    [property: JsonPropertyName("pair")] string Pair,
    [property: JsonPropertyName("source")] string Source,
    [property: JsonPropertyName("status")] string Status,
    [property: JsonPropertyName("error")] string? Error,
    [property: JsonPropertyName("run_id")] long? RunId,
    [property: JsonPropertyName("started_at")] DateTimeOffset StartedAt,
    [property: JsonPropertyName("has_baseline")] bool HasBaseline,
    [property: JsonPropertyName("profile")] ProfileJson? Profile,
    [property: JsonPropertyName("findings")] IReadOnlyList<FindingJson> Findings,
    [property: JsonPropertyName("window")] WindowJson? Window,
    [property: JsonPropertyName("judged_against")] JudgedAgainstJson? JudgedAgainst,
    [property: JsonPropertyName("window_ended_at")] DateTimeOffset? WindowEndedAt,
    [property: JsonPropertyName("back_dated")] bool BackDated,
    [property: JsonPropertyName("repeat_of_run")] long? RepeatOfRun);
