using System.Globalization;
using System.Text;
using Npgsql;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>
/// The watched tables of the cycle benchmark, in their own database on the benchmark server: <c>t01</c>…
/// each with <see cref="Rows"/> rows of <c>id</c>, <c>ts</c> (one row per second ending at <see cref="End"/>,
/// indexed) and <see cref="Columns"/> float8 columns <c>c01</c>… of assorted relationships (exact, linear
/// with noise, curved, monotone, independent, with ties, with rare outliers), so the engine meets the
/// kinds of data it meets in use. Built once and reused while its shape matches: loading 10M rows takes minutes.
/// </summary>
internal sealed class CycleTables(string adminConnectionString, int tables, int rows)
{
    /// <summary>The database's name: DRIFTWATCH_BENCH_DB when set (several benchmark runs on one shared server), else dw_bench_cycle.</summary>
    public static readonly string Database = Environment.GetEnvironmentVariable("DRIFTWATCH_BENCH_DB") is { Length: > 0 } name ? name : "dw_bench_cycle";
    public const int Columns = 20;

    /// <summary>Raise when the generated data changes, so an old database is rebuilt.</summary>
    private const int DataVersion = 1;

    public static readonly DateTimeOffset End = new(2026, 6, 1, 0, 0, 0, TimeSpan.Zero);

    // Per row: u, v, w ~ U(0, 100) shared by several columns; each c_k is one expression of them.
    private static readonly string[] Expressions =
    [
        "u",                                                 // c01
        "2 * u + 10",                                        // c02: exact linear function of c01
        "u + 10 * random()",                                 // c03: strong linear
        "u + 100 * random()",                                // c04: moderate linear
        "v",                                                 // c05
        "v * v / 100 + random()",                            // c06: curved in c05
        "100 * random()",                                    // c07: independent of all
        "exp(u / 25)",                                       // c08: monotone, not linear, in c01
        "round(u)",                                          // c09: ties
        "u + CASE WHEN random() < 0.001 THEN 1000 ELSE 0 END", // c10: rare outliers
        "w",                                                 // c11
        "-0.5 * w + 20 * random()",                          // c12: negative linear
        "w + v",                                             // c13
        "round(w / 10) * 10",                                // c14: few distinct values
        "ln(1 + w) + random() / 10",                         // c15
        "v - u + 5 * random()",                              // c16
        "sin(w / 10) * 50 + random()",                       // c17: periodic
        "3 * v + 7",                                         // c18: exact linear function of c05
        "u * v / 100",                                       // c19
        "100 * random() + 0.1 * w",                          // c20: weak
    ];

    public int Tables => tables;

    public int RowsPerTable => rows;

    public string ConnectionString => new NpgsqlConnectionStringBuilder(adminConnectionString) { Database = Database }.ToString();

    public static string TableName(int index) => "t" + (index + 1).ToString("00", CultureInfo.InvariantCulture);

    public static string ColumnName(int index) => "c" + (index + 1).ToString("00", CultureInfo.InvariantCulture);

    /// <summary>Creates the database and tables unless a database of this shape is already there.</summary>
    public async Task EnsureAsync(TextWriter log, CancellationToken ct)
    {
        if (await MatchesAsync(ct))
        {
            await log.WriteLineAsync($"Reusing database {Database}: {tables} tables x {rows:N0} rows.");
            return;
        }

        await DropAsync(ct);
        await ExecuteAsync(adminConnectionString, $"CREATE DATABASE {Database}", ct);
        for (var t = 0; t < tables; t++)
        {
            var started = System.Diagnostics.Stopwatch.StartNew();
            await ExecuteAsync(ConnectionString, CreateTableSql(t), ct);

            // VACUUM runs on its own: it sets the visibility map and reltuples, which the sample planner reads.
            await ExecuteAsync(ConnectionString, $"VACUUM ANALYZE {TableName(t)}", ct);
            await log.WriteLineAsync($"Loaded {TableName(t)} ({rows:N0} rows) in {started.Elapsed.TotalSeconds:0.0} s.");
        }

        await ExecuteAsync(ConnectionString, $"""
            CREATE TABLE cycle_bench_meta (tables int, rows int, version int);
            INSERT INTO cycle_bench_meta VALUES ({tables}, {rows}, {DataVersion});
            """, ct);
    }

    public async Task DropAsync(CancellationToken ct)
    {
        await ExecuteAsync(adminConnectionString, $"DROP DATABASE IF EXISTS {Database} WITH (FORCE)", ct);

        // FORCE ended the sessions of pooled connections to it; a pool must not hand them out again.
        NpgsqlConnection.ClearAllPools();
    }

    private string CreateTableSql(int t)
    {
        var name = TableName(t);
        var columns = new StringBuilder();
        var values = new StringBuilder();
        for (var c = 0; c < Columns; c++)
        {
            columns.Append(CultureInfo.InvariantCulture, $", {ColumnName(c)} float8");
            values.Append(CultureInfo.InvariantCulture, $", {Expressions[c]}");
        }

        // OFFSET 0 keeps the subquery from being flattened, so u, v, w are drawn once per row, not once per use.
        return $"""
            CREATE TABLE {name} (id bigint, ts timestamptz{columns});
            SELECT setseed({(0.1 + (t * 0.01)).ToString(CultureInfo.InvariantCulture)});
            INSERT INTO {name}
            SELECT i, timestamptz '{End:yyyy-MM-dd HH:mm:ss}+00' - ({rows} - i + 1) * interval '1 second'{values}
            FROM (SELECT i, 100 * random() AS u, 100 * random() AS v, 100 * random() AS w
                  FROM generate_series(1, {rows}) AS i OFFSET 0) AS s;
            CREATE INDEX ix_{name}_ts ON {name} (ts);
            """;
    }

    private async Task<bool> MatchesAsync(CancellationToken ct)
    {
        await using (var admin = new NpgsqlConnection(adminConnectionString))
        {
            await admin.OpenAsync(ct);
            await using var exists = new NpgsqlCommand("SELECT 1 FROM pg_database WHERE datname = $1", admin) { Parameters = { new() { Value = Database } } };
            if (await exists.ExecuteScalarAsync(ct) is null)
            {
                return false;
            }
        }

        await using var connection = new NpgsqlConnection(ConnectionString);
        await connection.OpenAsync(ct);
        await using var meta = new NpgsqlCommand("SELECT tables, rows, version FROM cycle_bench_meta", connection);
        try
        {
            await using var reader = await meta.ExecuteReaderAsync(ct);
            return await reader.ReadAsync(ct) && reader.GetInt32(0) == tables && reader.GetInt32(1) == rows && reader.GetInt32(2) == DataVersion;
        }
        catch (PostgresException e) when (e.SqlState == PostgresErrorCodes.UndefinedTable)
        {
            return false;
        }
    }

    private static async Task ExecuteAsync(string connectionString, string sql, CancellationToken ct)
    {
        await using var connection = new NpgsqlConnection(connectionString);
        await connection.OpenAsync(ct);
        await using var command = new NpgsqlCommand(sql, connection) { CommandTimeout = 0 };
        await command.ExecuteNonQueryAsync(ct);
    }
}
