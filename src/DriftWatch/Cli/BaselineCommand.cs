using System.CommandLine;
using System.Globalization;
using DriftWatch.Core.History;
using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using DriftWatch.Output;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;
using Spectre.Console;

namespace DriftWatch.Cli;

/// <summary>
/// <c>driftwatch baseline show|accept|reset PAIR</c>. Accept adopts the latest run after an intentional
/// change (a new unit, a re-modelled table), so that the change stops alerting.
/// </summary>
internal static class BaselineCommand
{
    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var command = new Command("baseline", "Show, accept or reset the baseline a pair is compared with.");
        command.Subcommands.Add(Sub(console, "show", "Show the pair's baseline: policy, period, each pooled run's figures and the spread between them, and the pooled profile.", ShowAsync));
        command.Subcommands.Add(Sub(console, "accept", "Adopt the pair's latest successful run as its baseline (after an intentional change).", AcceptAsync));
        command.Subcommands.Add(Sub(console, "reset", "Forget the pair's baseline; the next check rebuilds it by the pair's baseline policy.", ResetAsync));
        return command;
    }

    private delegate Task<int> BaselineAction(CliConsole console, IServiceProvider services, Core.Configuration.PairConfig pair, CancellationToken cancellationToken);

    private static Command Sub(CliConsole console, string name, string description, BaselineAction action)
    {
        var config = ConfigOption.Create();
        var pairName = new Argument<string>("PAIR") { Description = "The pair's name in the configuration." };
        var command = new Command(name, description) { pairName, config };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            var pair = PairSelection.Find(loaded, parse.GetValue(pairName)!);
            await using var services = await OneShotServices.StartAsync(loaded, verbose: false, ct);
            return await action(console, services, pair, ct);
        });
        return command;
    }

    private static async Task<int> ShowAsync(CliConsole console, IServiceProvider services, Core.Configuration.PairConfig pair, CancellationToken ct)
    {
        var baseline = await services.GetRequiredService<IHistoryStore>().GetBaselineAsync(pair.Name, ct);
        if (baseline is null)
        {
            console.WriteNote($"'{pair.Name}' has no baseline yet (policy {pair.Baseline}); it is built from stored runs at the next check.");
            return ExitCodes.Healthy;
        }

        Describe(console, baseline);
        BaselineRunsView.Render(console.Ansi, baseline);
        console.Ansi.MarkupLine($"[grey]The profile below describes the reservoir of {baseline.Points.UsedCount.ToString(System.Globalization.CultureInfo.InvariantCulture)} points pooled from those runs (for plots and distributions); a check is compared with the runs above.[/]");
        ProfileView.Render(console.Ansi, new ProfileReport(baseline.Profile, null, [], new ProfileLabels(pair.X, pair.Y, "baseline", null)));
        return ExitCodes.Healthy;
    }

    private static async Task<int> AcceptAsync(CliConsole console, IServiceProvider services, Core.Configuration.PairConfig pair, CancellationToken ct)
    {
        var now = services.GetRequiredService<TimeProvider>().GetUtcNow();
        var baseline = await services.GetRequiredService<BaselineService>().AcceptLatestAsync(pair, now, ct);
        if (baseline is null)
        {
            console.WriteError($"'{pair.Name}' has no successful run with sampled points to accept; run 'driftwatch check --pair {pair.Name}' first");
            return ExitCodes.UsageError;
        }

        console.Ansi.MarkupLine($"[green]✓[/] accepted the latest run of [bold]{Markup.Escape(pair.Name)}[/] as its baseline");
        Describe(console, baseline);
        return ExitCodes.Healthy;
    }

    private static async Task<int> ResetAsync(CliConsole console, IServiceProvider services, Core.Configuration.PairConfig pair, CancellationToken ct)
    {
        var deleted = await services.GetRequiredService<BaselineService>().ResetAsync(pair.Name, ct);
        console.Ansi.MarkupLine(deleted
            ? $"[green]✓[/] baseline of [bold]{Markup.Escape(pair.Name)}[/] reset; the next check rebuilds it ({Markup.Escape(pair.Baseline.ToString())})"
            : $"'{Markup.Escape(pair.Name)}' had no baseline; nothing to reset");
        return ExitCodes.Healthy;
    }

    private static void Describe(CliConsole console, StoredBaseline b) =>
        console.Ansi.MarkupLine(Markup.Escape(string.Create(
            CultureInfo.InvariantCulture,
            $"policy {b.PolicyText}{(b.Accepted ? " (accepted by hand)" : "")}; {b.RunCount} run(s) from {b.CoversFrom:yyyy-MM-dd HH:mm} to {b.CoversTo:yyyy-MM-dd HH:mm} UTC; {b.Points.UsedCount} points kept; built {b.CreatedAt:yyyy-MM-dd HH:mm} UTC")));
}
