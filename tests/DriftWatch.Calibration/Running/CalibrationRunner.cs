using System.Diagnostics;
using System.Globalization;
using DriftWatch.Calibration.Faults;
using DriftWatch.Calibration.Generation;
using DriftWatch.Calibration.Reporting;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Calibration.Running;

/// <summary>
/// Runs a calibration as the demo runs its scenario: a temporary folder, a real source database, a configuration
/// written and loaded back through <see cref="ConfigLoader"/>, the services of every command
/// (<see cref="DriftWatchServices.AddDriftWatch"/>) on a settable clock, then per simulated day one load of every
/// pair and one <see cref="CheckPass"/> over all of them at that day's check time. Nothing of the check path is
/// replaced; the results are read back from the store.
/// </summary>
internal sealed class CalibrationRunner(TextWriter progress)
{
    public async Task<CalibrationRun> RunAsync(CalibrationOptions options, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (options.Problems() is { Count: > 0 } problems)
        {
            throw new ArgumentException(string.Join("; ", problems), nameof(options));
        }

        var started = DateTimeOffset.UtcNow;
        var watch = Stopwatch.StartNew();
        var plan = CalibrationPlan.Build(options);
        var folder = Directory.CreateTempSubdirectory("driftwatch-calibration-");
        try
        {
            await using var source = options.Postgres is null
                ? (ISourceDatabase)await SqliteSourceDatabase.OpenAsync(folder.FullName, cancellationToken)
                : await PostgresSourceDatabase.CreateDatabaseAsync(options.Postgres, cancellationToken);
            await source.CreateAsync(plan.Pairs, cancellationToken);
            var config = LoadConfig(plan, source, folder.FullName);

            var clock = new DriftWatch.Demo.DemoClock(CalibrationPlan.CheckTimeOf(1));
            await using var services = new ServiceCollection()
                .AddLogging(logging => logging.ClearProviders()) // outcomes are read from the store, failures included
                .AddDriftWatch(config, clock)
                .BuildServiceProvider();
            await services.MigrateStoreAsync(cancellationToken);
            var pass = services.GetRequiredService<CheckPass>();

            long rowsLoaded = 0;
            var faultDayRows = new Dictionary<string, int>(StringComparer.Ordinal);
            for (var day = 1; day <= options.Days; day++)
            {
                var date = CalibrationPlan.DateOf(day);
                var loadWatch = Stopwatch.StartNew();
                var rows = Generate(plan, day, date);
                for (var i = 0; i < plan.Pairs.Count; i++)
                {
                    await source.LoadAsync(plan.Pairs[i], date, rows[i], cancellationToken);
                    rowsLoaded += rows[i].Length;
                    if (day == options.FaultDay && plan.Pairs[i].Fault is not null)
                    {
                        faultDayRows[plan.Pairs[i].Name] = rows[i].Length;
                    }
                }

                var load = loadWatch.Elapsed;
                clock.UtcNow = CalibrationPlan.CheckTimeOf(day);
                var checkWatch = Stopwatch.StartNew();
                var result = await pass.RunAsync(config.Pairs, progress: null, cancellationToken);
                var phase = day <= options.BaselineDays ? "baseline" : day >= options.FaultDay ? "faults" : "monitored";
                await progress.WriteLineAsync(string.Create(
                    CultureInfo.InvariantCulture,
                    $"day {day}/{options.Days} ({date:ddd}, {phase}): {rows.Sum(r => r.Length):N0} rows loaded in {load.TotalSeconds:0.0} s, {result.Checks.Count} checks in {checkWatch.Elapsed.TotalSeconds:0.0} s, {result.Checks.Sum(c => c.Findings.Count)} findings; elapsed {watch.Elapsed.TotalSeconds:0} s"));
            }

            var (healthy, faults) = await CalibrationReader.ReadAsync(
                plan,
                services.GetRequiredService<IHistoryStore>(),
                services.GetRequiredService<IAlertStore>(),
                faultDayRows,
                cancellationToken);
            return new CalibrationRun(plan, new CalibrationResults(
                started,
                watch.Elapsed,
                source.Describe,
                options.Seed,
                options.Days,
                options.BaselineDays,
                options.FaultDay,
                options.Quick,
                rowsLoaded,
                healthy,
                faults));
        }
        finally
        {
            Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
            if (options.Keep)
            {
                await Console.Error.WriteLineAsync($"kept: {folder.FullName}");
            }
            else
            {
                folder.Delete(recursive: true);
            }
        }
    }

    /// <summary>Every pair's rows of one day, generated in parallel (each from its own seed, so the order does not matter).</summary>
    private static CalibrationRow[][] Generate(CalibrationPlan plan, int day, DateOnly date)
    {
        var rows = new CalibrationRow[plan.Pairs.Count][];
        Parallel.For(0, plan.Pairs.Count, i =>
        {
            var pair = plan.Pairs[i];
            var healthy = DayGenerator.Generate(pair.Shape, date, Seeds.Random(plan.Options.Seed, pair.Index, day));
            rows[i] = pair.Fault is { } fault && day >= plan.Options.FaultDay
                ? FaultInjector.Apply(fault, healthy, Seeds.Random(plan.Options.Seed, pair.Index, day, 1))
                : healthy;
        });
        return rows;
    }

    /// <summary>The file is the runner's own, so a load error is a bug here; the loader's messages say where.</summary>
    private static DriftWatchConfig LoadConfig(CalibrationPlan plan, ISourceDatabase source, string folder)
    {
        var path = Path.Combine(folder, "driftwatch.yaml");
        File.WriteAllText(path, CalibrationConfigYaml.Build(plan, source));
        var loaded = ConfigLoader.Load(path, name => source.Environment.TryGetValue(name, out var value) ? value : Environment.GetEnvironmentVariable(name));
        if (!loaded.Ok || loaded.Config is null)
        {
            throw new InvalidOperationException("the calibration's own configuration did not load: " + string.Join("; ", loaded.Errors.Take(10)));
        }

        return loaded.Config;
    }
}

/// <summary>A finished run: what was simulated and what was measured.</summary>
internal sealed record CalibrationRun(CalibrationPlan Plan, CalibrationResults Results)
{
    public string Report => CalibrationReport.Text(Plan, Results);
}
