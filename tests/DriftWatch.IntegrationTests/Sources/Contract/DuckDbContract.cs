using System.Globalization;
using DriftWatch.Core.Configuration;
using DriftWatch.Sources;
using DriftWatch.Sources.DuckDb;
using DuckDB.NET.Data;

namespace DriftWatch.IntegrationTests.Sources.Contract;

/// <summary>
/// The contract on DuckDB, in a temp directory: the tables are built once in a database file with one
/// CREATE TABLE … AS each, then (for the Parquet variant) written out with COPY … TO (FORMAT parquet) as two
/// files per table. Engine oracle: DuckDB's corr, regr_slope, avg and var_samp, computed by a separate
/// in-memory connection over the same data.
/// </summary>
public abstract class DuckDbContract : SourceContract
{
    protected string Directory { get; } = Path.Combine(Path.GetTempPath(), "dw-duck-" + Guid.NewGuid().ToString("N"));

    protected string DatabaseFile => Path.Combine(Directory, "lake.duckdb");

    protected override string RandomMethod => "reservoir";

    // 3 rows with a null, NaN and ±Infinity in 3 more.
    protected override (long Rows, long Nulls, long Used) EdgeCounts => (106, 3, 100);

    /// <summary>The FROM item the oracle reads a logical table through.</summary>
    protected abstract string OracleFrom(string logical);

    public override Task InitializeAsync()
    {
        System.IO.Directory.CreateDirectory(Directory);
        // The writer is closed before any read-only open: in one process the first open's mode wins (RECIPES).
        using (var connection = new DuckDBConnection($"Data Source={DatabaseFile}"))
        {
            connection.Open();
            Execute(connection, $"""
                SET TimeZone = 'UTC';
                CREATE TABLE readings AS SELECT CAST(i AS INTEGER) AS id, CAST(i AS DOUBLE) AS x, CAST(3 * i + i % 7 AS DOUBLE) AS y,
                    TIMESTAMPTZ '2026-03-01 00:00:00+00' + i * INTERVAL 1 SECOND AS ts, 'r' || i AS label FROM range(1, {Rows + 1}) t(i);
                CREATE TABLE edges AS SELECT CAST(i AS DOUBLE) AS x, CAST(2 * i AS DOUBLE) AS y FROM range(1, 101) t(i)
                    UNION ALL SELECT * FROM (VALUES (NULL, 1.0), (2.0, NULL), (NULL, NULL), ('NaN'::DOUBLE, 1.0), (1.0, 'Infinity'::DOUBLE), ('-Infinity'::DOUBLE, 3.0)) v(x, y);
                CREATE TABLE huge AS SELECT i * 1e298 AS x, 2 * i * 1e298 + (i % 3) * 1e297 AS y FROM range(1, 101) t(i);
                CREATE SEQUENCE counter;
                """);
            foreach (var table in new[] { "readings", "edges", "huge" })
            {
                var dir = Path.Combine(Directory, table);
                System.IO.Directory.CreateDirectory(dir);
                Execute(connection, $"COPY (SELECT * FROM {table} WHERE rowid % 2 = 0) TO '{dir}/part1.parquet' (FORMAT parquet)");
                Execute(connection, $"COPY (SELECT * FROM {table} WHERE rowid % 2 = 1) TO '{dir}/part2.parquet' (FORMAT parquet)");
            }
        }

        return Task.CompletedTask;
    }

    public override Task DisposeAsync()
    {
        System.IO.Directory.Delete(Directory, recursive: true);
        return Task.CompletedTask;
    }

    private protected static IPairSource Create(string connection, TimeSpan? timeout) =>
        new DuckDbPairSource(new SourceConfig { Name = "contract", Kind = SourceKind.DuckDb, ConnectionString = connection, StatementTimeout = timeout ?? SourceConfig.DefaultStatementTimeout });

    private protected override IPairSource CreateUnreachableSource() => Create($"Data Source={Path.Combine(Directory, "missing.duckdb")}", null);

    protected override Task<double?[]> EngineFiguresAsync(string condition) =>
        Task.FromResult(OracleRow($"SELECT corr(y, x), regr_slope(y, x), avg(x), var_samp(y) FROM {OracleFrom("readings")} WHERE {condition}"));

    protected override Task<List<(double X, double Y)>> FiniteRowsAsync(string logical)
    {
        using var connection = OracleConnection();
        using var command = connection.CreateCommand();
        command.CommandText = $"SELECT x, y FROM {OracleFrom(logical)} WHERE isfinite(x) AND isfinite(y) ORDER BY x";
        using var reader = command.ExecuteReader();
        var rows = new List<(double X, double Y)>();
        while (reader.Read())
        {
            rows.Add((reader.GetDouble(0), reader.GetDouble(1)));
        }

        return Task.FromResult(rows);
    }

    protected override Task<bool> UntouchedAsync()
    {
        var count = Convert.ToInt64(OracleRow($"SELECT count(*) FROM {OracleFrom("readings")}")[0], CultureInfo.InvariantCulture);
        return Task.FromResult(count == Rows && !File.Exists(Path.Combine(Directory, "evil.csv")));
    }

    protected override PairConfig SlowPair() => QueryPair($"SELECT a.x AS x, b.y + c.y AS y FROM {OracleFrom("readings")} a, {OracleFrom("readings")} b, {OracleFrom("readings")} c");

    /// <summary>A separate in-memory DuckDB that reads the database file through a read-only ATTACH.</summary>
    private DuckDBConnection OracleConnection()
    {
        var connection = new DuckDBConnection("Data Source=:memory:");
        connection.Open();
        Execute(connection, $"ATTACH '{DatabaseFile}' AS lake (READ_ONLY)");
        return connection;
    }

    private double?[] OracleRow(string sql)
    {
        using var connection = OracleConnection();
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        using var reader = command.ExecuteReader();
        reader.Read();
        return [.. Enumerable.Range(0, reader.FieldCount).Select(i => reader.IsDBNull(i) ? (double?)null : Convert.ToDouble(reader.GetValue(i), CultureInfo.InvariantCulture))];
    }

    private static void Execute(DuckDBConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        command.ExecuteNonQuery();
    }
}

/// <summary>The contract on tables of a DuckDB database file, opened read-only.</summary>
public sealed class DuckDbFileContractTests : DuckDbContract
{
    private protected override IPairSource CreateSource(TimeSpan? timeout = null) => Create($"Data Source={DatabaseFile}", timeout);

    protected override string TableName(string logical) => logical;

    protected override string OracleFrom(string logical) => "lake." + logical;

    protected override IEnumerable<PairConfig> WriteAttempts() =>
    [
        // nextval writes the sequence: refused in a database attached read-only.
        Pair(where: "nextval('counter') > 0"),
        Pair(where: "true); DELETE FROM readings; SELECT (1"),
        QueryPair($"COPY readings TO '{Directory}/evil.csv'"),
    ];
}

/// <summary>The contract on Parquet files read by glob (two files per table) through an in-memory database.</summary>
public sealed class DuckDbParquetContractTests : DuckDbContract
{
    private protected override IPairSource CreateSource(TimeSpan? timeout = null) => Create("Data Source=:memory:", timeout);

    protected override string TableName(string logical) => Path.Combine(Directory, logical, "*.parquet");

    protected override string OracleFrom(string logical) => $"read_parquet('{Path.Combine(Directory, logical, "*.parquet")}')";

    protected override IEnumerable<PairConfig> WriteAttempts() =>
    [
        Pair(where: $"true); COPY (SELECT 42) TO '{Directory}/evil.csv'; SELECT (1"),
        QueryPair($"COPY (SELECT 42) TO '{Directory}/evil.csv'"),
    ];
}
