using System.CommandLine;
using System.Globalization;
using System.Text.Json.Serialization;
using DriftWatch.Core.Triage;
using DriftWatch.Hosting;
using DriftWatch.Output;
using DriftWatch.Store;
using DriftWatch.Triage;
using Microsoft.Extensions.DependencyInjection;
using Spectre.Console;

namespace DriftWatch.Cli;

/// <summary><c>driftwatch alerts log [PAIR]</c>: who acknowledged, snoozed or changed a baseline, when and why; newest first.</summary>
internal static class AlertsLogCommand
{
    public const int DefaultLimit = 50;

    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var config = ConfigOption.Create();
        var format = CommonOptions.Format();
        var pair = new Argument<string?>("PAIR") { Description = "Only this pair's entries (its name in the configuration or in the store).", Arity = ArgumentArity.ZeroOrOne };
        var limit = new Option<int>("--limit") { Description = $"At most this many entries (default {DefaultLimit}).", DefaultValueFactory = _ => DefaultLimit, HelpName = "N" };
        var command = new Command(
            "log",
            "The audit log: every acknowledgement, snooze, unsnooze, baseline accept and reset, from the dashboard or this command line, " +
            "with who (the dashboard's sign-in name or proxy header, or the operating-system user), when (UTC) and why. Newest first.")
        {
            pair, config, format, limit,
        };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            if (parse.GetValue(limit) is < 1 or > 10_000)
            {
                throw new CliUsageException("--limit must be between 1 and 10000");
            }

            await using var services = await OneShotServices.StartAsync(loaded, verbose: false, ct);
            var entries = await services.GetRequiredService<IAuditStore>().ListAsync(parse.GetValue(pair), parse.GetValue(limit), ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                console.Out.WriteLine(JsonContract.Serialize(new AuditLogJson([.. entries.Select(AuditEntryJson.From)])));
                return ExitCodes.Healthy;
            }

            if (entries.Count == 0)
            {
                console.WriteNote("the audit log is empty" + (parse.GetValue(pair) is { } p ? $" for '{p}'" : string.Empty));
                return ExitCodes.Healthy;
            }

            var table = new Table().Border(TableBorder.Rounded).Title("[bold]Audit log[/]");
            table.AddColumns("when (UTC)", "who", "via", "action", "pair", "alert", "run", "why", "detail");
            foreach (var e in entries)
            {
                table.AddRow(
                    e.At.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", CultureInfo.InvariantCulture),
                    Markup.Escape(e.Actor),
                    e.Via,
                    AuditStore.Name(e.Action),
                    Markup.Escape(e.Pair ?? ""),
                    e.AlertId?.ToString(CultureInfo.InvariantCulture) ?? "",
                    e.RunId?.ToString(CultureInfo.InvariantCulture) ?? "",
                    Markup.Escape(e.Reason ?? ""),
                    Markup.Escape(e.Detail ?? ""));
            }

            console.Ansi.Write(table);
            return ExitCodes.Healthy;
        });
        return command;
    }
}

internal sealed record AuditLogJson([property: JsonPropertyName("entries")] IReadOnlyList<AuditEntryJson> Entries);

internal sealed record AuditEntryJson(
    [property: JsonPropertyName("id")] long Id,
    [property: JsonPropertyName("at")] DateTimeOffset At,
    [property: JsonPropertyName("actor")] string Actor,
    [property: JsonPropertyName("via")] string Via,
    [property: JsonPropertyName("action")] string Action,
    [property: JsonPropertyName("pair")] string? Pair,
    [property: JsonPropertyName("alert_id")] long? AlertId,
    [property: JsonPropertyName("run_id")] long? RunId,
    [property: JsonPropertyName("reason")] string? Reason,
    [property: JsonPropertyName("detail")] string? Detail)
{
    public static AuditEntryJson From(AuditEntry e)
    {
        ArgumentNullException.ThrowIfNull(e);
        return new(e.Id, e.At, e.Actor, e.Via, AuditStore.Name(e.Action), e.Pair, e.AlertId, e.RunId, e.Reason, e.Detail);
    }
}
