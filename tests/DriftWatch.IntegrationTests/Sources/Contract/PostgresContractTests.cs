using System.Net;
using System.Net.Sockets;
using DriftWatch.Core.Configuration;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources;
using DriftWatch.Sources.Postgres;

namespace DriftWatch.IntegrationTests.Sources.Contract;

/// <summary>The contract on PostgreSQL. Engine oracle: PostgreSQL's corr, regr_slope, avg and var_samp.</summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresContractTests(PostgresServer server) : SourceContract
{
    private PostgresDatabase _db = null!;

    protected override string RandomMethod => "random";

    // 3 rows with a null, NaN and ±Infinity in 3 more.
    protected override (long Rows, long Nulls, long Used) EdgeCounts => (106, 3, 100);

    public override async Task InitializeAsync()
    {
        _db = await PostgresDatabase.CreateAsync(server);
        await _db.ExecuteAsync($"""
            CREATE TABLE readings (id integer PRIMARY KEY, x float8, y float8, ts timestamptz NOT NULL, label text);
            INSERT INTO readings SELECT i, i, 3 * i + (i % 7), timestamptz '2026-03-01 00:00:00+00' + i * interval '1 second', 'r' || i
            FROM generate_series(1, {Rows}) AS i;
            CREATE TABLE edges (x float8, y float8);
            INSERT INTO edges SELECT i, 2 * i FROM generate_series(1, 100) AS i;
            INSERT INTO edges VALUES (NULL, 1), (2, NULL), (NULL, NULL), ('NaN', 1), (1, 'Infinity'), ('-Infinity', 3);
            CREATE TABLE huge (x float8, y float8);
            INSERT INTO huge SELECT i * 1e298, 2 * i * 1e298 + (i % 3) * 1e297 FROM generate_series(1, 100) AS i;
            CREATE FUNCTION wipe_readings() RETURNS boolean LANGUAGE plpgsql AS $$ BEGIN DELETE FROM readings; RETURN true; END $$;
            ANALYZE;
            """);
    }

    public override async Task DisposeAsync()
    {
        await server.DropDatabaseAsync(_db.ConnectionString);
        await _db.DisposeAsync();
    }

    private protected override IPairSource CreateSource(TimeSpan? timeout = null) =>
        new PostgresPairSource(new SourceConfig { Name = "contract", Kind = SourceKind.Postgres, ConnectionString = _db.ConnectionString, StatementTimeout = timeout ?? SourceConfig.DefaultStatementTimeout });

    private protected override IPairSource CreateUnreachableSource()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        var port = ((IPEndPoint)listener.LocalEndpoint).Port;
        listener.Stop();
        return new PostgresPairSource(new SourceConfig { Name = "contract", Kind = SourceKind.Postgres, ConnectionString = $"Host=127.0.0.1;Port={port};Username=nobody;Database=none;Timeout=5" });
    }

    protected override string TableName(string logical) => logical;

    protected override async Task<double?[]> EngineFiguresAsync(string condition) =>
        (await _db.RowsAsync($"SELECT corr(y, x), regr_slope(y, x), avg(x), var_samp(y) FROM readings WHERE {condition}"))[0];

    protected override async Task<List<(double X, double Y)>> FiniteRowsAsync(string logical) =>
        [.. (await _db.RowsAsync($"SELECT x, y FROM {logical} WHERE x IS NOT NULL AND y IS NOT NULL ORDER BY x")).Select(r => (r[0]!.Value, r[1]!.Value)).Where(r => double.IsFinite(r.Item1) && double.IsFinite(r.Item2))];

    protected override IEnumerable<PairConfig> WriteAttempts() =>
    [
        Pair(where: "wipe_readings()"),
        Pair(where: "true); DELETE FROM readings; SELECT (1"),
        QueryPair("WITH d AS (DELETE FROM readings RETURNING x, y) SELECT x, y FROM d"),
    ];

    protected override async Task<bool> UntouchedAsync() => await _db.ScalarAsync<long>("SELECT count(*) FROM readings") == Rows;

    protected override PairConfig SlowPair() => QueryPair("SELECT x, y FROM readings WHERE pg_sleep(0.001) IS NOT NULL");
}
