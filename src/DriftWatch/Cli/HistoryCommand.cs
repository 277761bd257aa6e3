using System.CommandLine;
using System.Globalization;
using System.Text.Json.Serialization;
using DriftWatch.Core.History;
using DriftWatch.Hosting;
using DriftWatch.Output;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;
using Spectre.Console;

namespace DriftWatch.Cli;

/// <summary><c>driftwatch history PAIR</c>: the pair's recent runs from the store, newest first.</summary>
internal static class HistoryCommand
{
    public const int DefaultLast = 20;

    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var config = ConfigOption.Create();
        var pairName = new Argument<string>("PAIR") { Description = "The pair's name in the configuration." };
        var last = new Option<int>("--last", "-n") { Description = $"How many runs to show (default {DefaultLast}).", DefaultValueFactory = _ => DefaultLast, HelpName = "N" };
        var format = CommonOptions.Format();
        var command = new Command("history", "Show a pair's recent runs: time, status, n, r, ρ, slope, shape and findings, newest first.")
        {
            pairName, config, last, format,
        };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            var pair = PairSelection.Find(loaded, parse.GetValue(pairName)!);
            var n = parse.GetValue(last);
            if (n < 1)
            {
                throw new CliUsageException($"--last must be at least 1, was {n}");
            }

            await using var services = await OneShotServices.StartAsync(loaded, verbose: false, ct);
            var runs = await services.GetRequiredService<IHistoryStore>().GetRunsAsync(pair.Name, n, includePoints: false, ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                console.Out.WriteLine(JsonContract.Serialize(new HistoryJson(pair.Name, [.. runs.Select(RunJson.Of)])));
                return ExitCodes.Healthy;
            }

            if (runs.Count == 0)
            {
                console.WriteNote($"no runs of '{pair.Name}' in the store yet (run 'driftwatch check --pair {pair.Name}')");
                return ExitCodes.Healthy;
            }

            // A heading line, not the table's title: a title wraps to the table's width, which cuts a long pair name.
            console.Ansi.MarkupLine($"[bold]{Markup.Escape(pair.Name)}[/]: {Markup.Escape(pair.X)} vs {Markup.Escape(pair.Y)}");
            var table = new Table().Border(TableBorder.Rounded);
            table.AddColumns("started (UTC)", "status", "n", "r", "ρ", "slope", "shape", "findings");
            foreach (var run in runs)
            {
                var p = run.Profile;
                table.AddRow(
                    run.StartedAt.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", CultureInfo.InvariantCulture),
                    RunStatusText.Markup(run.Status),
                    Figures.Count(p?.NUsed),
                    Figures.Number(p?.PearsonR),
                    Figures.Number(p?.SpearmanRho),
                    Figures.Number(p?.Slope),
                    p is null ? "" : JsonContract.Name(p.Shape),
                    run.Status != RunStatus.Succeeded
                        ? "[red]" + Markup.Escape(run.Error ?? "") + "[/]"
                        : string.Join(", ", run.Findings.OrderByDescending(f => f.Severity).Select(f => SeverityStyle.Markup(f.Severity) + " " + Markup.Escape(JsonContract.Name(f.Kind)))));
            }

            console.Ansi.Write(table);
            return ExitCodes.Healthy;
        });
        return command;
    }
}

internal sealed record HistoryJson(
    [property: JsonPropertyName("pair")] string Pair,
    [property: JsonPropertyName("runs")] IReadOnlyList<RunJson> Runs);
