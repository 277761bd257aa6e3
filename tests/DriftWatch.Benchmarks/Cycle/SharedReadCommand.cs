using System.Diagnostics;
using System.Globalization;
using DriftWatch.Core.Configuration;
using DriftWatch.Sources.Postgres;
using Npgsql;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>
/// <c>dotnet run -c Release --project tests/DriftWatch.Benchmarks -- shared-read [--table t01] [--repeats 3]</c>: on one
/// 1M-row table of the cycle benchmark's database (built by <c>cycle</c>, reused), the time of PostgreSQL's own
/// <c>corr(y, x)</c> over the table, then of the shared read (<see cref="PostgresPairSource.SampleGroupAsync"/>:
/// aggregate scan and sample) of 10 and of 100 pairs of the table, the first read of a fresh source without column
/// hints (a survey of the columns, then the aggregate) and the following ones (lean form), and the lean aggregate
/// statement alone, without the sample. Each figure is a median, printed with the load average.
/// </summary>
internal static class SharedReadCommand
{
    public const string Name = "shared-read";

    public static async Task<int> RunAsync(string[] args)
    {
        var admin = Environment.GetEnvironmentVariable("DRIFTWATCH_BENCH_PG");
        if (string.IsNullOrEmpty(admin))
        {
            await Console.Error.WriteLineAsync("Set DRIFTWATCH_BENCH_PG (see the cycle command).");
            return 2;
        }

        var table = args.SkipWhile(a => a != "--table").Skip(1).FirstOrDefault() ?? "t01";
        var repeats = int.Parse(args.SkipWhile(a => a != "--repeats").Skip(1).FirstOrDefault() ?? "3", CultureInfo.InvariantCulture);
        var tables = new CycleTables(admin, 10, 1_000_000);
        await tables.EnsureAsync(Console.Out, CancellationToken.None);

        var corr = new List<double>();
        await using (var connection = new NpgsqlConnection(tables.ConnectionString))
        {
            await connection.OpenAsync();
            for (var i = 0; i < repeats; i++)
            {
                var watch = Stopwatch.StartNew();
                await using var command = new NpgsqlCommand($"SELECT corr(c02, c01) FROM {table}", connection);
                await command.ExecuteScalarAsync();
                corr.Add(watch.Elapsed.TotalMilliseconds);
            }
        }

        await Report($"PostgreSQL corr(c02, c01) over {table}", corr);
        foreach (var count in new[] { 10, 100 })
        {
            var source = new SourceConfig
            {
                Name = "bench",
                Kind = SourceKind.Postgres,
                ConnectionString = tables.ConnectionString,
                StatementTimeout = TimeSpan.FromMinutes(10),
            };
            var pairs = Combinations().Take(count)
                .Select(c => new PairConfig { Name = $"{table}-{c.X}-{c.Y}", Source = "bench", Table = table, X = c.X, Y = c.Y })
                .ToList();
            await using var reader = new PostgresPairSource(source);
            var first = Stopwatch.StartNew();
            var reads = await reader.SampleGroupAsync(pairs, CycleTables.End, CancellationToken.None);
            await Report($"shared read of {count} pairs, first read of a fresh source (survey of the columns, then the aggregate)", [first.Elapsed.TotalMilliseconds]);
            var alone = reads.Count(r => r is null);
            var later = new List<double>();
            for (var i = 0; i < repeats; i++)
            {
                var watch = Stopwatch.StartNew();
                await reader.SampleGroupAsync(pairs, CycleTables.End, CancellationToken.None);
                later.Add(watch.Elapsed.TotalMilliseconds);
            }

            await Report($"shared read of {count} pairs, later (lean form){(alone > 0 ? $", {alone} left alone" : string.Empty)}", later);
            await Report($"aggregate statement alone of {count} pairs (lean form, no sample)", await TimeLeanAggregateAsync(tables.ConnectionString, pairs, repeats));
        }

        return 0;
    }

    /// <summary>
    /// The lean aggregate statement of a group exactly as a later shared read sends it (references: the columns' means,
    /// JIT off), timed without the sample: the figure the issue compares with <c>corr</c>.
    /// </summary>
    private static async Task<List<double>> TimeLeanAggregateAsync(string connectionString, List<PairConfig> pairs, int repeats)
    {
        var target = Sources.PairTarget.From(pairs[0]);
        var columns = pairs.SelectMany(p => new[] { p.X, p.Y }).Distinct(StringComparer.Ordinal).ToList();
        var index = columns.Select((c, i) => (c, i)).ToDictionary(e => e.c, e => e.i, StringComparer.Ordinal);
        var sql = new PostgresGroupSql(new PostgresPairSql(target, null), target, columns, [.. pairs.Select(p => (index[p.X], index[p.Y]))], [.. columns.Select(_ => false)]);
        await using var connection = new NpgsqlConnection(connectionString);
        await connection.OpenAsync();
        await using (var setup = new NpgsqlCommand("SET jit = off", connection))
        {
            await setup.ExecuteNonQueryAsync();
        }

        var means = new double[columns.Count];
        await using (var avg = new NpgsqlCommand($"SELECT {string.Join(", ", columns.Select(c => $"avg({c})"))} FROM {target.Table}", connection))
        await using (var reader = await avg.ExecuteReaderAsync())
        {
            await reader.ReadAsync();
            for (var c = 0; c < columns.Count; c++)
            {
                means[c] = reader.GetDouble(c);
            }
        }

        var times = new List<double>();
        for (var i = 0; i < repeats; i++)
        {
            var (text, parameters) = sql.Lean(means);
            var watch = Stopwatch.StartNew();
            await using var batch = new NpgsqlBatch(connection);
            batch.BatchCommands.Add(parameters.Command(text));
            await using (var reader = await batch.ExecuteReaderAsync())
            {
                await reader.ReadAsync();
            }

            times.Add(watch.Elapsed.TotalMilliseconds);
        }

        return times;
    }

    private static async Task Report(string what, List<double> ms)
    {
        var load = (await File.ReadAllTextAsync("/proc/loadavg")).Split(' ')[0];
        await Console.Out.WriteLineAsync($"{what}: median {CycleCommand.Median(ms):0} ms of {ms.Count} ({string.Join(", ", ms.Select(m => m.ToString("0", CultureInfo.InvariantCulture)))}), load {load}");
    }

    private static IEnumerable<(string X, string Y)> Combinations()
    {
        for (var a = 0; a < CycleTables.Columns; a++)
        {
            for (var b = a + 1; b < CycleTables.Columns; b++)
            {
                yield return (CycleTables.ColumnName(a), CycleTables.ColumnName(b));
            }
        }
    }
}
