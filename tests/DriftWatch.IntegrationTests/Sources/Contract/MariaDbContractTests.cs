using System.Globalization;
using System.Net;
using System.Net.Sockets;
using DriftWatch.Core.Configuration;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources;
using DriftWatch.Sources.MySql;
using MySqlConnector;

namespace DriftWatch.IntegrationTests.Sources.Contract;

/// <summary>
/// The contract on MariaDB (source kind mysql). Engine oracle: MariaDB's AVG(x) and VAR_SAMP(y); MariaDB has
/// no corr or regr_slope, so r and the slope are checked against MathNet over every row only. MySQL's
/// DOUBLE holds no NaN or Infinity, so <c>edges</c> has nulls only.
/// </summary>
[Collection(UsesMariaDb.Name)]
public sealed class MariaDbContractTests(MariaDbServer server) : SourceContract
{
    private string _cs = null!;

    protected override string RandomMethod => "random filter";

    protected override (long Rows, long Nulls, long Used) EdgeCounts => (103, 3, 100);

    public override async Task InitializeAsync()
    {
        _cs = await server.CreateDatabaseAsync();
        await MariaDbServer.ExecuteAsync(_cs, $"""
            CREATE TABLE readings (id INT PRIMARY KEY, x DOUBLE, y DOUBLE, ts DATETIME NOT NULL, label VARCHAR(20));
            INSERT INTO readings SELECT seq, seq, 3 * seq + seq % 7, TIMESTAMP'2026-03-01 00:00:00' + INTERVAL seq SECOND, CONCAT('r', seq) FROM seq_1_to_{Rows};
            CREATE TABLE edges (x DOUBLE, y DOUBLE);
            INSERT INTO edges SELECT seq, 2 * seq FROM seq_1_to_100;
            INSERT INTO edges VALUES (NULL, 1), (2, NULL), (NULL, NULL);
            CREATE TABLE huge (x DOUBLE, y DOUBLE);
            INSERT INTO huge SELECT seq * 1e298, 2 * seq * 1e298 + (seq % 3) * 1e297 FROM seq_1_to_100;
            CREATE FUNCTION wipe_readings() RETURNS INT MODIFIES SQL DATA BEGIN DELETE FROM readings; RETURN 1; END;
            """);
    }

    public override Task DisposeAsync() => server.DropDatabaseAsync(_cs);

    private protected override IPairSource CreateSource(TimeSpan? timeout = null) =>
        new MySqlPairSource(new SourceConfig { Name = "contract", Kind = SourceKind.MySql, ConnectionString = _cs, StatementTimeout = timeout ?? SourceConfig.DefaultStatementTimeout });

    private protected override IPairSource CreateUnreachableSource()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        var port = ((IPEndPoint)listener.LocalEndpoint).Port;
        listener.Stop();
        return new MySqlPairSource(new SourceConfig { Name = "contract", Kind = SourceKind.MySql, ConnectionString = $"Server=127.0.0.1;Port={port};User ID=nobody;Connection Timeout=5" });
    }

    protected override string TableName(string logical) => logical;

    protected override async Task<double?[]> EngineFiguresAsync(string condition)
    {
        var row = await RowAsync($"SELECT AVG(x), VAR_SAMP(y) FROM readings WHERE {condition}");
        return [null, null, row[0], row[1]];
    }

    protected override async Task<List<(double X, double Y)>> FiniteRowsAsync(string logical)
    {
        await using var connection = new MySqlConnection(_cs);
        await connection.OpenAsync();
        await using var command = new MySqlCommand($"SELECT x, y FROM {logical} WHERE x IS NOT NULL AND y IS NOT NULL ORDER BY x", connection);
        await using var reader = await command.ExecuteReaderAsync();
        var rows = new List<(double X, double Y)>();
        while (await reader.ReadAsync())
        {
            rows.Add((reader.GetDouble(0), reader.GetDouble(1)));
        }

        return rows;
    }

    protected override IEnumerable<PairConfig> WriteAttempts() =>
    [
        // Refused by the READ ONLY transaction (error 1792).
        Pair(where: "wipe_readings() = 1"),
        // Refused before it runs: a second statement, and a DDL that would commit the transaction implicitly.
        Pair(where: "1=1); DELETE FROM readings; SELECT (1"),
        Pair(where: "1=1) /*!; COMMIT; DROP TABLE readings */ AND (1"),
        QueryPair("SELECT x, y FROM readings; TRUNCATE readings"),
    ];

    protected override async Task<bool> UntouchedAsync() =>
        Convert.ToInt64((await RowAsync("SELECT COUNT(*) FROM readings"))[0], CultureInfo.InvariantCulture) == Rows;

    protected override PairConfig SlowPair() => QueryPair("SELECT a.x AS x, b.y + c.y AS y FROM readings a, readings b, readings c");

    private async Task<double?[]> RowAsync(string sql)
    {
        await using var connection = new MySqlConnection(_cs);
        await connection.OpenAsync();
        await using var command = new MySqlCommand(sql, connection);
        await using var reader = await command.ExecuteReaderAsync();
        await reader.ReadAsync();
        return [.. Enumerable.Range(0, reader.FieldCount).Select(i => reader.IsDBNull(i) ? (double?)null : Convert.ToDouble(reader.GetValue(i), CultureInfo.InvariantCulture))];
    }
}
