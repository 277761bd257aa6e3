using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;
using System.Text.Json.Serialization;
using DriftWatch.Configuration;
using DriftWatch.Core.Alerting;
using DriftWatch.Hosting;
using DriftWatch.Output;
using DriftWatch.Store;
using DriftWatch.Triage;
using Microsoft.Extensions.DependencyInjection;
using Spectre.Console;

namespace DriftWatch.Cli;

/// <summary>
/// <c>driftwatch alerts list|ack|snooze|unsnooze|log</c>: the alert states the worker keeps in the store. The
/// changes go through <see cref="TriageActions"/> (as the dashboard's forms do) and are recorded in the audit log
/// under the operating-system user's name.
/// </summary>
internal static class AlertsCommand
{
    public static readonly TimeSpan RecentlyCleared = TimeSpan.FromDays(7);

    /// <summary>At most this many stored alerts are read for <c>alerts list</c>.</summary>
    public const int MaxListed = 500;

    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var command = new Command("alerts", "List, acknowledge or snooze alerts, and read the log of who did so.");
        command.Subcommands.Add(List(console));
        command.Subcommands.Add(Ack(console));
        command.Subcommands.Add(Snooze(console));
        command.Subcommands.Add(Unsnooze(console));
        command.Subcommands.Add(AlertsLogCommand.Create(console));
        return command;
    }

    private static Command List(CliConsole console)
    {
        var config = ConfigOption.Create();
        var format = CommonOptions.Format();
        var command = new Command(
            "list",
            "Open alerts (watching, confirmed) and those cleared in the last 7 days, with active snoozes. Order: open before cleared, " +
            "then severity (critical first), state (confirmed before watching), first seen (newest first), id. Info findings are not " +
            "alerts and are not listed (the dashboard's pair pages show them).") { config, format };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            await using var services = await OneShotServices.StartAsync(loaded, verbose: false, ct);
            var store = services.GetRequiredService<IAlertStore>();
            var now = services.GetRequiredService<TimeProvider>().GetUtcNow();
            var alerts = AlertListing.Arrange(await store.ListAlertsAsync(now - RecentlyCleared, MaxListed, ct));
            var snoozes = await store.ListSnoozesAsync(now, ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                console.Out.WriteLine(JsonContract.Serialize(new AlertListJson(
                    [.. alerts.Select(AlertJson.Of)],
                    [.. snoozes.Select(SnoozeJson.Of)])));
                return ExitCodes.Healthy;
            }

            if (alerts.Count == 0)
            {
                console.WriteNote("no open alerts and none cleared in the last 7 days");
            }
            else
            {
                var table = new Table().Border(TableBorder.Rounded).Title("[bold]Alerts[/]");
                table.AddColumns("id", "pair", "kind", "severity", "status", "first seen (UTC)", "confirmed", "cleared");
                foreach (var a in alerts)
                {
                    table.AddRow(
                        a.Id.ToString(CultureInfo.InvariantCulture),
                        Markup.Escape(a.Pair),
                        Markup.Escape(JsonContract.Name(a.Kind)),
                        SeverityStyle.Markup(a.Severity),
                        JsonContract.Name(a.Status) + (a.IsAcked ? " (acked)" : ""),
                        Time(a.FirstSeen),
                        Time(a.ConfirmedAt),
                        Time(a.ClearedAt));
                }

                console.Ansi.Write(table);
                foreach (var a in alerts)
                {
                    console.Ansi.MarkupLine($"[bold]#{a.Id}[/] {Markup.Escape(a.Message)}");
                }
            }

            foreach (var s in snoozes)
            {
                console.Ansi.MarkupLine($"snoozed: [bold]{Markup.Escape(s.Pair)}[/] until {Time(s.Until)} UTC{(s.Reason is null ? "" : " (" + Markup.Escape(s.Reason) + ")")}");
            }

            return ExitCodes.Healthy;
        });
        return command;
    }

    private static Command Ack(CliConsole console)
    {
        var config = ConfigOption.Create();
        var id = new Argument<long>("ID") { Description = "The alert's id (see 'alerts list'; mails carry it too).", CustomParser = AlertId };
        var reason = ReasonOption();
        var command = new Command("ack", "Acknowledge an open alert: no reminders while it stays confirmed; it still clears (with a notice) when a check shows it gone. Recorded in 'alerts log' under your operating-system user name.") { id, config, reason };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            await using var services = await OneShotServices.StartAsync(loaded, verbose: false, ct);
            var alertId = parse.GetValue(id);
            if (await services.GetRequiredService<TriageActions>().AckAsync(alertId, Actor.FromOperatingSystem(), parse.GetValue(reason), ct) is null)
            {
                console.WriteError($"no open alert with id {alertId} (see 'driftwatch alerts list')");
                return ExitCodes.UsageError;
            }

            console.Ansi.MarkupLine($"[green]✓[/] alert {alertId} acknowledged");
            return ExitCodes.Healthy;
        });
        return command;
    }

    private static Command Snooze(CliConsole console)
    {
        var config = ConfigOption.Create();
        var pair = new Argument<string>("PAIR") { Description = "The pair's name in the configuration." };
        var duration = new Option<string>("--for") { Description = "How long, e.g. 30m, 8h, 2d.", Required = true, HelpName = "DURATION" };
        var reason = new Option<string?>("--reason") { Description = "Why (shown in 'alerts list', on the dashboard and in 'alerts log').", HelpName = "TEXT" };
        var command = new Command("snooze", "Hold back a pair's notifications for a while (a planned migration, a known incident); its states are still tracked. At most 31 days. Recorded in 'alerts log'.") { pair, config, duration, reason };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            var target = PairSelection.Find(loaded, parse.GetValue(pair)!);
            if (!DurationSyntax.TryParse(parse.GetValue(duration) ?? "", out var span, out var problem) || span < TimeSpan.FromMinutes(1) || span > TriageActions.MaxSnooze)
            {
                throw new CliUsageException($"--for {problem ?? "must be between 1 minute and 31 days"}");
            }

            await using var services = await OneShotServices.StartAsync(loaded, verbose: false, ct);
            var until = await services.GetRequiredService<TriageActions>().SnoozeAsync(target.Name, span, Actor.FromOperatingSystem(), parse.GetValue(reason), ct);
            console.Ansi.MarkupLine($"[green]✓[/] [bold]{Markup.Escape(target.Name)}[/] snoozed until {Time(until)} UTC");
            return ExitCodes.Healthy;
        });
        return command;
    }

    private static Command Unsnooze(CliConsole console)
    {
        var config = ConfigOption.Create();
        var pair = new Argument<string>("PAIR") { Description = "The pair's name in the configuration." };
        var reason = ReasonOption();
        var command = new Command("unsnooze", "End a pair's snooze now. Recorded in 'alerts log'.") { pair, config, reason };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            var target = PairSelection.Find(loaded, parse.GetValue(pair)!);
            await using var services = await OneShotServices.StartAsync(loaded, verbose: false, ct);
            var removed = await services.GetRequiredService<TriageActions>().UnsnoozeAsync(target.Name, Actor.FromOperatingSystem(), parse.GetValue(reason), ct);
            console.Ansi.MarkupLine(removed ? $"[green]✓[/] snooze of [bold]{Markup.Escape(target.Name)}[/] ended" : $"'{Markup.Escape(target.Name)}' was not snoozed");
            return ExitCodes.Healthy;
        });
        return command;
    }

    /// <summary>A positive whole number; anything else is a usage error that says what an id looks like.</summary>
    private static long AlertId(ArgumentResult result)
    {
        var token = result.Tokens.Count > 0 ? result.Tokens[0].Value : string.Empty;
        if (long.TryParse(token, NumberStyles.None, CultureInfo.InvariantCulture, out var value) && value > 0)
        {
            return value;
        }

        result.AddError($"an alert id is a positive whole number such as 12 (the first column of 'driftwatch alerts list'), was '{token}'");
        return 0;
    }

    internal static Option<string?> ReasonOption() =>
        new("--reason") { Description = "Why, in a few words; kept in 'alerts log' with your name and the time.", HelpName = "TEXT" };

    private static string Time(DateTimeOffset? at) => at is null ? "" : at.Value.UtcDateTime.ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture);
}

internal sealed record AlertListJson(
    [property: JsonPropertyName("alerts")] IReadOnlyList<AlertJson> Alerts,
    [property: JsonPropertyName("snoozes")] IReadOnlyList<SnoozeJson> Snoozes);
