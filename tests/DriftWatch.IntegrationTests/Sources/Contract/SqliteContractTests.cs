using DriftWatch.Core.Configuration;
using DriftWatch.IntegrationTests.Sources.Sqlite;
using DriftWatch.Sources;
using DriftWatch.Sources.Sqlite;
using Microsoft.Data.Sqlite;

namespace DriftWatch.IntegrationTests.Sources.Contract;

/// <summary>
/// The contract on SQLite. Engine oracle: SQLite's avg() for the mean of x (it has no corr, regr_slope or
/// var_samp; those are checked against MathNet only). SQLite stores NaN as NULL and keeps ±Infinity.
/// </summary>
public sealed class SqliteContractTests : SourceContract, IDisposable
{
    private readonly SqliteFile _file = new();

    public void Dispose() => _file.Dispose();

    protected override string RandomMethod => "random";

    // 3 rows with a null, one whose NaN became NULL, and ±Infinity in 2 more.
    protected override (long Rows, long Nulls, long Used) EdgeCounts => (106, 4, 100);

    public override Task InitializeAsync()
    {
        var start = new DateTimeOffset(2026, 3, 1, 0, 0, 0, TimeSpan.Zero).ToUnixTimeSeconds();
        _file.Execute($"""
            CREATE TABLE readings (id INTEGER PRIMARY KEY, x REAL, y REAL, ts TEXT NOT NULL, label TEXT);
            WITH RECURSIVE s(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM s WHERE i < {Rows})
            INSERT INTO readings SELECT i, i, 3 * i + (i % 7), strftime('%Y-%m-%d %H:%M:%S', {start} + i, 'unixepoch'), 'r' || i FROM s;
            CREATE TABLE edges (x REAL, y REAL);
            WITH RECURSIVE s(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM s WHERE i < 100) INSERT INTO edges SELECT i, 2 * i FROM s;
            INSERT INTO edges VALUES (NULL, 1), (2, NULL), (NULL, NULL), (0.0 / 0.0, 1), (1, 9e999), (-9e999, 3);
            CREATE TABLE huge (x REAL, y REAL);
            WITH RECURSIVE s(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM s WHERE i < 100) INSERT INTO huge SELECT i * 1e298, 2 * i * 1e298 + (i % 3) * 1e297 FROM s;
            """);
        return Task.CompletedTask;
    }

    public override Task DisposeAsync() => Task.CompletedTask;

    private protected override IPairSource CreateSource(TimeSpan? timeout = null) =>
        new SqlitePairSource(new SourceConfig { Name = "contract", Kind = SourceKind.Sqlite, ConnectionString = $"Data Source={_file.Path}", StatementTimeout = timeout ?? SourceConfig.DefaultStatementTimeout });

    private protected override IPairSource CreateUnreachableSource() =>
        new SqlitePairSource(new SourceConfig { Name = "contract", Kind = SourceKind.Sqlite, ConnectionString = $"Data Source={_file.Path}.missing" });

    protected override string TableName(string logical) => logical;

    protected override Task<double?[]> EngineFiguresAsync(string condition) =>
        Task.FromResult<double?[]>([null, null, _file.Scalar<double>($"SELECT avg(x) FROM readings WHERE {condition}"), null]);

    protected override Task<List<(double X, double Y)>> FiniteRowsAsync(string logical)
    {
        using var connection = new SqliteConnection($"Data Source={_file.Path};Mode=ReadOnly;Pooling=False");
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = $"SELECT x, y FROM {logical} WHERE x IS NOT NULL AND y IS NOT NULL ORDER BY x";
        using var reader = command.ExecuteReader();
        var rows = new List<(double X, double Y)>();
        while (reader.Read())
        {
            double x = reader.GetDouble(0), y = reader.GetDouble(1);
            if (double.IsFinite(x) && double.IsFinite(y))
            {
                rows.Add((x, y));
            }
        }

        return Task.FromResult(rows);
    }

    protected override IEnumerable<PairConfig> WriteAttempts() =>
    [
        Pair(where: "1); DELETE FROM readings; SELECT (1"),
        QueryPair("DELETE FROM readings RETURNING x, y"),
    ];

    protected override Task<bool> UntouchedAsync() => Task.FromResult(_file.Scalar<long>("SELECT count(*) FROM readings") == Rows);

    protected override PairConfig SlowPair() => QueryPair("SELECT a.x AS x, b.y AS y FROM readings a, readings b, readings c");
}
