using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Columns;
using BenchmarkDotNet.Configs;
using BenchmarkDotNet.Jobs;
using DriftWatch.Core.Configuration;
using DriftWatch.Sources.Postgres;
using Npgsql;

namespace DriftWatch.Benchmarks.Monitor;

/// <summary>
/// The source side of one check (sample + push-down figures) on a 1M- and a 10M-row PostgreSQL table.
/// Both tables hold one row per second ending at the check time, so the last day is 86 400 rows in each:
/// a windowed check should cost the same on both (goal: 10M ≤ 1.3 × 1M); a whole-table check samples in
/// constant time but its exact push-down aggregate reads every row, so it grows with the table.
/// Needs DRIFTWATCH_BENCH_PG (an Npgsql connection string of a server where it may CREATE DATABASE).
/// </summary>
[Config(typeof(MonitorConfig))]
#pragma warning disable CA1001 // BenchmarkDotNet owns the lifetime: the source is disposed in [GlobalCleanup].
public class MonitorBenchmarks
#pragma warning restore CA1001
{
    public static readonly DateTimeOffset Now = new(2026, 6, 1, 0, 0, 0, TimeSpan.Zero);

    private string _admin = "";
    private string _database = "";
    private PostgresPairSource _source = null!;
    private PairConfig _windowed = null!;
    private PairConfig _whole = null!;

    [Params(1_000_000, 10_000_000)]
    public int Rows { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        _admin = Environment.GetEnvironmentVariable("DRIFTWATCH_BENCH_PG")
            ?? throw new InvalidOperationException("Set DRIFTWATCH_BENCH_PG to an Npgsql connection string of a server where the benchmark may CREATE DATABASE.");
        _database = "dw_bench_" + Rows.ToString(System.Globalization.CultureInfo.InvariantCulture);
        Execute(_admin, $"DROP DATABASE IF EXISTS {_database} WITH (FORCE)");
        Execute(_admin, $"CREATE DATABASE {_database}");
        var cs = new NpgsqlConnectionStringBuilder(_admin) { Database = _database, CommandTimeout = 0 }.ToString();
        Execute(cs, $"""
            CREATE TABLE readings (id bigint, x float8, y float8, ts timestamptz);
            SELECT setseed(0.5);
            INSERT INTO readings
            SELECT i, i % 1000 + random(), 2 * (i % 1000) + 10 * random(), timestamptz '{Now:yyyy-MM-dd HH:mm:ss}+00' - ({Rows} - i + 1) * interval '1 second'
            FROM generate_series(1, {Rows}) AS i;
            CREATE INDEX ix_readings_ts ON readings (ts);
            """);
        // VACUUM must run on its own: sets the visibility map so the window is read by an index-only-friendly plan.
        Execute(cs, "VACUUM ANALYZE readings");
        _source = new PostgresPairSource(new SourceConfig { Name = "bench", Kind = SourceKind.Postgres, ConnectionString = cs, StatementTimeout = TimeSpan.FromMinutes(10) });
        _windowed = new PairConfig { Name = "bench.windowed", Source = "bench", Table = "readings", X = "x", Y = "y", Window = new WindowSpec("ts", TimeSpan.FromDays(1)) };
        _whole = _windowed with { Name = "bench.whole", Window = null };
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        _source.DisposeAsync().AsTask().GetAwaiter().GetResult();
        NpgsqlConnection.ClearAllPools();
        Execute(_admin, $"DROP DATABASE IF EXISTS {_database} WITH (FORCE)");
    }

    [Benchmark]
    public async Task<int> WindowedCheck() => (await _source.SampleAsync(_windowed, Now, CancellationToken.None)).Sample.UsedCount;

    [Benchmark]
    public async Task<int> WholeTableCheck() => (await _source.SampleAsync(_whole, Now, CancellationToken.None)).Sample.UsedCount;

    private static void Execute(string connectionString, string sql)
    {
        using var connection = new NpgsqlConnection(connectionString);
        connection.Open();
        using var command = new NpgsqlCommand(sql, connection) { CommandTimeout = 0 };
        command.ExecuteNonQuery();
    }
}

/// <summary>
/// Few iterations: each operation takes tens to hundreds of milliseconds and the setup minutes. Median and
/// minimum are shown beside the mean because the database server shares the machine's cores.
/// </summary>
public sealed class MonitorConfig : ManualConfig
{
    public MonitorConfig()
    {
        AddJob(Job.ShortRun.WithWarmupCount(2).WithIterationCount(15).WithId("source"));
        AddColumn(StatisticColumn.Median, StatisticColumn.Min);
    }
}
