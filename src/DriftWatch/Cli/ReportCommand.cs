using System.CommandLine;
using System.Data.Common;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard.Export;
using DriftWatch.Output;
using DriftWatch.Store;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Cli;

/// <summary>
/// <c>driftwatch report</c>: writes the dashboard's pages as self-contained HTML files (index.html, alerts.html,
/// pairs/&lt;name&gt;.html) from the history store, to attach to an incident ticket or read offline.
/// Reads the store, never writes it (no migration either: an unknown store is reported, not created).
/// </summary>
internal static class ReportCommand
{
    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var configOption = ConfigOption.Create();
        var outOption = new Option<string>("--out") { Description = "Folder to write the pages into; created if missing, files in it overwritten.", HelpName = "DIR", Required = true };
        var pairOption = new Option<string?>("--pair") { Description = "Only this pair: its page, and the overview and alerts narrowed to it.", HelpName = "NAME" };
        var command = new Command(
            "report",
            "Write the dashboard as static HTML files (CSS, script and plots inline, relative links) for an incident ticket or offline reading. " +
            "Plots carry sampled data values out of the database.\n\n" +
            "Example: driftwatch report --config driftwatch.yaml --out incident-4711 --pair orders.total_vs_items")
        {
            configOption, outOption, pairOption,
        };

        command.SetAction((parsed, cancellationToken) =>
            RunAsync(console, parsed.GetValue(configOption), parsed.GetValue(outOption)!, parsed.GetValue(pairOption), cancellationToken));
        return command;
    }

    private static async Task<int> RunAsync(CliConsole console, string? configPath, string outDir, string? pair, CancellationToken cancellationToken)
    {
        var config = ConfigOption.Load(configPath, console);
        if (config is null)
        {
            return ExitCodes.UsageError;
        }

        configPath = config.FilePath;
        if (MissingSqliteStore(config.Store) is { } missing)
        {
            throw new CliUsageException($"the store file {missing} does not exist (store.connection in {configPath}); nothing has been recorded yet");
        }

        var database = StoreFactory.CreateDatabase(config.Store);
        try
        {
            var history = StoreFactory.CreateHistoryStore(database, config.Store);
            var alerts = new AlertStore(database);
            var result = await StaticReport.WriteAsync(config, history, alerts, new OutboxStore(database), outDir, pair, cancellationToken);
            console.Out.WriteLine($"wrote {result.Files.Count} pages to {Path.GetFullPath(outDir)} (open index.html)");
            console.WriteNote("the pages contain sampled data values from the watched databases; share them as you would the data.");
            return ExitCodes.Healthy;
        }
        catch (KeyNotFoundException ex)
        {
            throw new CliUsageException(ex.Message, ex);
        }
        catch (DbException ex)
        {
            console.WriteError($"cannot read the store ({config.Store.Kind}): {ex.Message}");
            return ExitCodes.RunFailures;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            console.WriteError($"cannot write to {outDir}: {ex.Message}");
            return ExitCodes.UsageError;
        }
        finally
        {
            if (database is IAsyncDisposable disposable)
            {
                await disposable.DisposeAsync();
            }
        }
    }

    /// <summary>The SQLite file the store names when it does not exist (opening it would create an empty one).</summary>
    private static string? MissingSqliteStore(StoreConfig store)
    {
        if (store.Kind != StoreKind.Sqlite)
        {
            return null;
        }

        var source = new SqliteConnectionStringBuilder(store.ConnectionString).DataSource;
        return source == ":memory:" || File.Exists(source) ? null : source;
    }
}
