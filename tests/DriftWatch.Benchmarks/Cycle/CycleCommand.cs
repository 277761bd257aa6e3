using DriftWatch.Cli;
using DriftWatch.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using Microsoft.Extensions.DependencyInjection;
using Npgsql;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>
/// <c>dotnet run -c Release --project tests/DriftWatch.Benchmarks -- cycle [--pairs 1000] …</c>: one monitor
/// cycle of many pairs on PostgreSQL through <see cref="CheckPass"/>, the path of the <c>check</c> command and
/// the scheduler, with the configuration read by <see cref="ConfigLoader"/> and the services built by
/// <see cref="OneShotServices"/>.
/// </summary>
/// <remarks>
/// A plain Stopwatch command rather than a BenchmarkDotNet class: one cycle takes tens of seconds and leaves a
/// store behind that the next cycle reads, so BenchmarkDotNet's pilot, overhead and many-iteration machinery
/// buys nothing and would take an hour. It runs warm-up cycles (the first builds the baselines), then measured
/// ones, and reports each one's wall time, this process's CPU time, the database server's CPU time and this
/// process's peak RSS (VmHWM, reset before each cycle), then the median.
/// Needs DRIFTWATCH_BENCH_PG (an Npgsql connection string of a server where it may CREATE DATABASE).
/// </remarks>
internal static class CycleCommand
{
    public const string Name = "cycle";

    public static Task<int> RunAsync(string[] args) => CycleOptions.Command(RunAsync).Parse(args).InvokeAsync();

    private static async Task<int> RunAsync(CycleOptions options, CancellationToken ct)
    {
        var admin = Environment.GetEnvironmentVariable("DRIFTWATCH_BENCH_PG");
        if (string.IsNullOrEmpty(admin))
        {
            await Console.Error.WriteLineAsync("Set DRIFTWATCH_BENCH_PG to an Npgsql connection string of a server where the benchmark may CREATE DATABASE.");
            return 2;
        }

        var tables = new CycleTables(admin, options.Tables, options.Rows);
        await tables.EnsureAsync(Console.Out, ct);
        var server = await FindServerAsync(tables.ConnectionString, ct);
        var statements = new StatementStats(tables.ConnectionString);
        var haveStatements = await statements.TryEnableAsync(ct);

        var folder = Directory.CreateTempSubdirectory("driftwatch-bench-cycle-");
        try
        {
            var yaml = CycleConfigYaml.Build(options.Pairs, options.Tables, options.MaxConcurrentQueries, options.Window);
            var path = Path.Combine(folder.FullName, "driftwatch.yaml");
            await File.WriteAllTextAsync(path, yaml, ct);
            var loaded = ConfigLoader.Parse(yaml, path, name => name == CycleConfigYaml.ConnectionVariable ? tables.ConnectionString : Environment.GetEnvironmentVariable(name), folder.FullName);
            if (loaded.Config is not { } config)
            {
                foreach (var error in loaded.Errors.Take(10))
                {
                    await Console.Error.WriteLineAsync(error.ToString());
                }

                return 2;
            }

            await Console.Out.WriteLineAsync(
                $"{config.Pairs.Count} pairs over {options.Tables} tables of {options.Rows:N0} rows; " +
                $"{(options.Window is null ? "whole-table pairs" : $"window last {options.Window} on ts")}; " +
                $"max_concurrent_queries {config.Sources[0].MaxConcurrentQueries}, {MonitorCycle.MaxParallelChecks} checks in parallel; " +
                $"sample {config.Pairs[0].Sample.Rows} rows, method {config.Pairs[0].Sample.Method}; store {folder.FullName}" +
                (options.RestartEachCycle ? "; services started afresh before every cycle" : string.Empty));

            var services = await OneShotServices.StartAsync(config, verbose: false, ct, new ShiftedClock(CycleTables.End));
            var measured = new List<CycleMeasurement>();
            var failures = 0;
            for (var i = 0; i < options.Warmups + options.Cycles; i++)
            {
                var warmup = i < options.Warmups;
                if (options.RestartEachCycle && i > 0)
                {
                    // Outside the measurement: a new process's start is not part of its first cycle.
                    await services.DisposeAsync();
                    NpgsqlConnection.ClearAllPools();
                    services = await OneShotServices.StartAsync(config, verbose: false, ct, new ShiftedClock(CycleTables.End));
                }

                var pass = services.GetRequiredService<CheckPass>();
                if (!warmup && measured.Count == 0 && haveStatements)
                {
                    await statements.ResetAsync(ct);
                }

                var (result, m) = await CycleMeasurement.MeasureAsync(server, () => pass.RunAsync(config.Pairs, null, ct));
                var failed = result.Checks.Where(c => c.Status == RunStatus.Failed).ToList();
                failures += failed.Count;
                await Console.Out.WriteLineAsync(
                    $"{(warmup ? "warm-up " : "cycle   ")}{i + 1}: {m.Format()} | {result.Checks.Count - failed.Count} ok, {failed.Count} failed, " +
                    $"{result.Checks.Sum(c => c.Findings.Count)} findings, {result.Checks.Count(c => c.HasBaseline)} with baseline");
                foreach (var f in failed.Take(3))
                {
                    await Console.Out.WriteLineAsync($"  failed {f.Pair.Name}: {f.Error}");
                }

                if (!warmup)
                {
                    measured.Add(m);
                }
            }

            if (measured.Count > 0)
            {
                var median = Median(measured.Select(m => m.Wall.TotalSeconds));
                await Console.Out.WriteLineAsync(
                    $"median of {measured.Count}: {median:0.00} s per cycle ({median * 1000 / config.Pairs.Count:0.0} ms per pair); " +
                    $"client CPU {Median(measured.Select(m => m.ClientCpu.TotalSeconds)):0.00} s, " +
                    $"server CPU {(server is null ? "n/a" : $"{Median(measured.Select(m => m.ServerCpu!.Value.TotalSeconds)):0.00} s")}; " +
                    $"peak RSS max {measured.Max(m => m.PeakRssBytes) / 1048576.0:0} MB");
            }

            if (haveStatements && measured.Count > 0)
            {
                await Console.Out.WriteLineAsync($"Server executor time by statement, per measured cycle (pg_stat_statements, {measured.Count} cycles):");
                foreach (var kind in await statements.ReadAsync(ct))
                {
                    await Console.Out.WriteLineAsync(
                        $"  {kind.Kind,-38} {kind.Calls / measured.Count,6} calls  {kind.TotalMs / measured.Count / 1000,7:0.00} s  {kind.TotalMs / Math.Max(1, kind.Calls),8:0.0} ms/call");
                }
            }

            if (options.Stages)
            {
                await CycleStages.RunAsync(services, config, server, Console.Out, ct);
            }

            await services.DisposeAsync();
            return failures == 0 ? 0 : 1;
        }
        finally
        {
            NpgsqlConnection.ClearAllPools();
            folder.Delete(recursive: true);
            if (options.DropData)
            {
                await tables.DropAsync(ct);
            }
        }
    }

    /// <summary>The local server's CPU counter, found from one backend's parent process; null when the server is elsewhere.</summary>
    private static async Task<ServerCpu?> FindServerAsync(string connectionString, CancellationToken ct)
    {
        await using var connection = new NpgsqlConnection(connectionString);
        await connection.OpenAsync(ct);
        await using var command = new NpgsqlCommand("SELECT pg_backend_pid()", connection);
        var pid = (int)(await command.ExecuteScalarAsync(ct))!;
        return ServerCpu.ForBackend(pid);
    }

    internal static double Median(IEnumerable<double> values)
    {
        var sorted = values.Order().ToArray();
        return sorted.Length % 2 == 1 ? sorted[sorted.Length / 2] : (sorted[(sorted.Length / 2) - 1] + sorted[sorted.Length / 2]) / 2;
    }
}
