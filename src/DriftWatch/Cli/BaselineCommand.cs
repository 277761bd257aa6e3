using System.CommandLine;
using System.Globalization;
using DriftWatch.Core.History;
using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using DriftWatch.Output;
using DriftWatch.Store;
using DriftWatch.Triage;
using Microsoft.Extensions.DependencyInjection;
using Spectre.Console;

namespace DriftWatch.Cli;

/// <summary>
/// <c>driftwatch baseline show|accept|reset PAIR</c>. Accept adopts a run (the latest, or <c>--run ID</c>) after an
/// intentional change (a new unit, a re-modelled table), so that the change stops alerting; reset makes the next
/// runs build a new baseline. Both go through <see cref="TriageActions"/> (as the dashboard's forms do) and are
/// recorded in the audit log under the operating-system user's name.
/// </summary>
internal static class BaselineCommand
{
    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var command = new Command("baseline", "Show, accept or reset the baseline a pair is compared with.");
        command.Subcommands.Add(Sub(console, "show", "Show the pair's baseline: policy, period, each pooled run's figures and the spread between them, and the pooled profile.", [], ShowAsync));

        var run = new Option<long?>("--run") { Description = "Accept this run (an id from 'driftwatch history PAIR') instead of the latest successful one.", HelpName = "ID" };
        var force = new Option<bool>("--force") { Description = "Accept the run even though it has warning or critical findings (they may be the intended change)." };
        var acceptReason = AlertsCommand.ReasonOption();
        command.Subcommands.Add(Sub(
            console,
            "accept",
            "Adopt a run as the pair's baseline after an intentional change: the latest successful run with sampled points, or --run ID. " +
            "Prints the run it adopts (id, time, figures). A run with warning-or-worse findings is refused (exit code 1) unless --force; " +
            "an unknown or unusable run is exit code 2. Recorded in 'alerts log'.",
            [run, force, acceptReason],
            (c, services, pair, parse, ct) => AcceptAsync(c, services, pair, parse.GetValue(run), parse.GetValue(force), parse.GetValue(acceptReason), ct)));

        var resetReason = AlertsCommand.ReasonOption();
        command.Subcommands.Add(Sub(
            console,
            "reset",
            "Forget the pair's baseline; a new one is pooled by the pair's baseline policy from the runs started AFTER the reset " +
            "(first_runs N: the next N runs), never from runs already stored. Recorded in 'alerts log'.",
            [resetReason],
            (c, services, pair, parse, ct) => ResetAsync(c, services, pair, parse.GetValue(resetReason), ct)));
        return command;
    }

    private delegate Task<int> BaselineAction(CliConsole console, IServiceProvider services, Core.Configuration.PairConfig pair, ParseResult parse, CancellationToken cancellationToken);

    private static Command Sub(CliConsole console, string name, string description, Option[] options, BaselineAction action)
    {
        var config = ConfigOption.Create();
        var pairName = new Argument<string>("PAIR") { Description = "The pair's name in the configuration." };
        var command = new Command(name, description) { pairName, config };
        foreach (var option in options)
        {
            command.Options.Add(option);
        }

        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            var pair = PairSelection.Find(loaded, parse.GetValue(pairName)!);
            await using var services = await OneShotServices.StartAsync(loaded, verbose: false, ct);
            return await action(console, services, pair, parse, ct);
        });
        return command;
    }

    private static async Task<int> ShowAsync(CliConsole console, IServiceProvider services, Core.Configuration.PairConfig pair, ParseResult parse, CancellationToken ct)
    {
        var baseline = await services.GetRequiredService<IHistoryStore>().GetBaselineAsync(pair.Name, ct);
        if (baseline is null)
        {
            var resetAt = await services.GetRequiredService<BaselineService>().GetResetAsync(pair.Name, ct);
            console.WriteNote(resetAt is { } at
                ? $"'{pair.Name}' has no baseline: it was reset {Time(at)} UTC; the next one is pooled (policy {pair.Baseline}) from runs started after that."
                : $"'{pair.Name}' has no baseline yet (policy {pair.Baseline}); it is built from stored runs at the next check.");
            return ExitCodes.Healthy;
        }

        Describe(console, baseline);
        BaselineRunsView.Render(console.Ansi, baseline);
        console.Ansi.MarkupLine($"[grey]The profile below describes the reservoir of {baseline.Points.UsedCount.ToString(CultureInfo.InvariantCulture)} points pooled from those runs (for plots and distributions); a check is compared with the runs above.[/]");
        ProfileView.Render(console.Ansi, new ProfileReport(baseline.Profile, null, [], new ProfileLabels(pair.X, pair.Y, Pooled(baseline), null) { CurrentWord = "baseline" }));
        return ExitCodes.Healthy;
    }

    private static async Task<int> AcceptAsync(CliConsole console, IServiceProvider services, Core.Configuration.PairConfig pair, long? runId, bool force, string? reason, CancellationToken ct)
    {
        var outcome = await services.GetRequiredService<TriageActions>().AcceptBaselineAsync(pair, runId, force, Actor.FromOperatingSystem(), reason, ct);
        if (outcome.Run is { } run)
        {
            console.Ansi.MarkupLine((outcome.Result == AcceptResult.Accepted ? "adopting " : "candidate: ") + Markup.Escape(TriageActions.Figures(run)) + Worst(run));
        }

        switch (outcome.Result)
        {
            case AcceptResult.Accepted:
                console.Ansi.MarkupLine($"[green]✓[/] {Markup.Escape(outcome.Message)}");
                Describe(console, outcome.Baseline!);
                return ExitCodes.Healthy;
            case AcceptResult.Refused:
                console.WriteError(outcome.Message);
                return ExitCodes.Findings;
            default:
                console.WriteError(outcome.Message);
                return ExitCodes.UsageError;
        }
    }

    private static async Task<int> ResetAsync(CliConsole console, IServiceProvider services, Core.Configuration.PairConfig pair, string? reason, CancellationToken ct)
    {
        var stored = await services.GetRequiredService<IHistoryStore>().CountRunsAsync(pair.Name, ct);
        var (had, at) = await services.GetRequiredService<TriageActions>().ResetBaselineAsync(pair, Actor.FromOperatingSystem(), reason, ct);
        console.Ansi.MarkupLine(had
            ? $"[green]✓[/] baseline of [bold]{Markup.Escape(pair.Name)}[/] reset at {Time(at)} UTC"
            : $"'{Markup.Escape(pair.Name)}' had no baseline; reset recorded at {Time(at)} UTC");
        console.Ansi.MarkupLine(Markup.Escape(
            $"The next baseline is pooled ({pair.Baseline}) from the runs started after the reset; the {stored.ToString(CultureInfo.InvariantCulture)} run(s) stored before it are not used. Until then checks have no baseline to compare with."));
        return ExitCodes.Healthy;
    }

    private static string Worst(RunRecord run) =>
        run.WorstSeverity is { } worst ? " · worst finding " + SeverityStyle.Markup(worst) : " · no findings";

    /// <summary>"pooled from N runs, M points, R rows": the runs, the reservoir kept of their points, the rows their windows held.</summary>
    internal static string Pooled(StoredBaseline b)
    {
        ArgumentNullException.ThrowIfNull(b);
        var rows = b.Runs.Count > 0 ? b.Runs.Sum(r => (double)r.Rows) : b.Profile.NRows * (double)b.RunCount;
        return string.Create(CultureInfo.InvariantCulture, $"pooled from {Figures.Count(b.RunCount)} runs, {Figures.Count(b.Points.UsedCount)} points, {Figures.Count((long)Math.Round(rows))} rows");
    }

    private static void Describe(CliConsole console, StoredBaseline b) =>
        console.Ansi.MarkupLine(Markup.Escape(string.Create(
            CultureInfo.InvariantCulture,
            $"policy {b.PolicyText}{(b.Accepted ? " (accepted by hand)" : "")}; {Pooled(b)}; runs from {b.CoversFrom:yyyy-MM-dd HH:mm} to {b.CoversTo:yyyy-MM-dd HH:mm} UTC; built {b.CreatedAt:yyyy-MM-dd HH:mm} UTC")));

    private static string Time(DateTimeOffset at) => at.UtcDateTime.ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture);
}
