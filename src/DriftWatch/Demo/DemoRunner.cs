using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard.Export;
using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using DriftWatch.Output;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;
using Serilog.Events;

namespace DriftWatch.Demo;

/// <summary>
/// Runs the scenario end to end: a fresh folder, the invented database, a configuration written and loaded
/// back through <see cref="ConfigLoader"/>, then one load and one <see cref="CheckPass"/> per simulated day
/// through the composition root every command uses (<see cref="DriftWatchServices"/>), with a
/// <see cref="DemoClock"/> in place of the system clock. The outcome is read back from the store.
/// </summary>
internal sealed class DemoRunner(CliConsole console)
{
    public async Task<DemoRun> RunAsync(DemoOptions options, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (options.Days is < 1 or > DemoOptions.MaxDays)
        {
            throw new DemoException(string.Create(CultureInfo.InvariantCulture, $"--days must be between 1 and {DemoOptions.MaxDays}, was {options.Days}"));
        }

        var folder = DemoFolder.Prepare(options.Out);
        var sourceKind = options.PostgresConnection is null ? SourceKind.Sqlite : SourceKind.Postgres;
        await using var scenario = sourceKind == SourceKind.Sqlite
            ? (IScenarioDatabase)await SqliteScenarioDatabase.OpenAsync(Path.Combine(folder, DemoFolder.ScenarioDatabaseFile), cancellationToken)
            : await PostgresScenarioDatabase.OpenAsync(options.PostgresConnection!, cancellationToken);
        await scenario.CreateAsync(TerminalScenario.Pairs, cancellationToken);

        var configPath = Path.Combine(folder, DemoFolder.ConfigFile);
        await File.WriteAllTextAsync(configPath, DemoConfigFile.Text(sourceKind), cancellationToken);
        var config = LoadConfig(configPath, options.PostgresConnection);

        var output = console.Out;
        output.WriteLine($"DriftWatch demo: {TerminalScenario.TerminalName} (invented data), {options.Days} simulated day{(options.Days == 1 ? "" : "s")}");
        output.WriteLine($"  output folder   {folder}");
        output.WriteLine($"  pipeline data   {scenario.Describe}");
        output.WriteLine($"  configuration   {configPath}");
        output.WriteLine();

        var clock = new DemoClock(TerminalScenario.CheckTimeOf(1));
        // Errors only unless --verbose: the day lines already say what each check found (a failing check
        // would otherwise log a warning per day on top of its line).
        await using var services = await OneShotServices.StartAsync(config, options.Verbose ? LogEventLevel.Information : LogEventLevel.Error, cancellationToken, clock);
        var pass = services.GetRequiredService<CheckPass>();
        var lines = new DemoDayLine();
        for (var day = 1; day <= options.Days; day++)
        {
            await LoadDayAsync(scenario, day, cancellationToken);
            clock.UtcNow = TerminalScenario.CheckTimeOf(day);
            var result = await pass.RunAsync(config.Pairs, progress: null, cancellationToken);
            foreach (var line in lines.Describe(day, result))
            {
                output.WriteLine(line);
            }
        }

        var history = services.GetRequiredService<IHistoryStore>();
        var alerts = services.GetRequiredService<IAlertStore>();
        var outcome = await DemoSummary.BuildAsync(history, alerts, options.Days, cancellationToken);
        var mail = Path.Combine(folder, DemoFolder.MailFolder);
        var mails = Directory.Exists(mail) ? Directory.GetFiles(mail, "*.eml").Length : 0;

        // The dashboard's pages as files, dated at the last simulated check so ages read as they would have then.
        var reportFolder = Path.Combine(folder, DemoFolder.ReportFolder);
        await StaticReport.WriteAsync(config, history, alerts, services.GetRequiredService<IOutboxStore>(), reportFolder, pair: null, clock, cancellationToken);
        return new DemoRun(folder, configPath, config, outcome, mails, clock.UtcNow)
        {
            ReportPath = Path.Combine(reportFolder, "index.html"),
        };
    }

    /// <summary>
    /// The file was written by the demo itself, so an error here is a bug of the demo; the loader's messages
    /// (file:line:column: key: message) say where. The PostgreSQL connection string reaches the loader
    /// through its environment lookup, as ${DRIFTWATCH_DEMO_PG}, and is never written to the file.
    /// </summary>
    private static DriftWatchConfig LoadConfig(string path, string? postgres)
    {
        var result = ConfigLoader.Load(path, name =>
            name == DemoConfigFile.PostgresVariable && postgres is not null ? postgres : Environment.GetEnvironmentVariable(name));
        if (!result.Ok || result.Config is null)
        {
            throw new DemoException("the demo's own configuration did not load: " + string.Join("; ", result.Errors));
        }

        return result.Config;
    }

    private static async Task LoadDayAsync(IScenarioDatabase scenario, int day, CancellationToken cancellationToken)
    {
        if (day == TerminalScenario.RenameDay)
        {
            await scenario.RenameTableAsync(TerminalScenario.RenamedPair.Table, TerminalScenario.RenamedTo, cancellationToken);
        }

        foreach (var pair in TerminalScenario.Pairs)
        {
            await scenario.LoadAsync(pair, TerminalScenario.TableOn(pair, day), TerminalScenario.RowsFor(pair, day), cancellationToken);
        }
    }
}

/// <summary>A finished demo: where its files are, the configuration it ran with, and what it found.</summary>
/// <param name="LastCheck">The simulated time of the last check; the dashboard is served as of then.</param>
internal sealed record DemoRun(string Folder, string ConfigPath, DriftWatchConfig Config, DemoOutcome Outcome, int MailFiles, DateTimeOffset LastCheck)
{
    /// <summary>The static dashboard export (index.html), when one was written.</summary>
    public string? ReportPath { get; init; }
}
