using System.CommandLine;
using DriftWatch.Output;
using DriftWatch.Sources;
using Spectre.Console;

namespace DriftWatch.Cli;

/// <summary>
/// <c>driftwatch validate</c>: the configuration, then (unless --offline) that every source answers and
/// every pair's table or query and both columns exist and are numeric.
/// </summary>
internal static class ValidateCommand
{
    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var config = ConfigOption.Create();
        var offline = new Option<bool>("--offline")
        {
            Description = "Check the file only; do not connect to any source. Secrets need not be set: an unset environment variable in a " +
                "secret key (connection, password, access_token) or a missing password file is reported as 'not checked offline', not as an error.",
        };
        var pair = new Option<string?>("--pair", "-p") { Description = "Validate only this pair against its source.", HelpName = "NAME" };
        var command = new Command(
            "validate",
            "Validate the configuration file (every error with file:line:column), then connect to each source and check " +
            "that each pair's table or query and both columns exist and are numeric. Exit code 0: valid; 2: configuration error; 3: a source or column problem.")
        {
            config, offline, pair,
        };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console, parse.GetValue(offline));
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            console.Ansi.MarkupLine($"[green]✓[/] {Markup.Escape(loaded.FilePath ?? "configuration")}: {loaded.Sources.Count} source(s), {loaded.Pairs.Count} pair(s), {loaded.Alerting.MailingLists.Count} mailing list(s)");
            if (parse.GetValue(offline))
            {
                return ExitCodes.Healthy;
            }

            var pairs = PairSelection.Select(loaded, parse.GetValue(pair));
            await using var sources = new SourceFactory();
            var failures = 0;
            foreach (var p in pairs)
            {
                var source = loaded.FindSource(p.Source)!;
                try
                {
                    await sources.Create(source).ValidateAsync(p, ct);
                    console.Ansi.MarkupLine($"[green]✓[/] {Markup.Escape(p.Name)}: {Markup.Escape(p.X)} and {Markup.Escape(p.Y)} are numeric in {Markup.Escape(p.Table ?? "the query")} ({Markup.Escape(source.Name)})");
                }
                catch (SourceException ex)
                {
                    failures++;
                    console.Ansi.MarkupLine($"[red]✗[/] {Markup.Escape(p.Name)}: {Markup.Escape(ex.Message)}");
                }
            }

            return failures == 0 ? ExitCodes.Healthy : ExitCodes.RunFailures;
        });
        return command;
    }
}
