using System.Net;
using System.Net.Sockets;
using DriftWatch.Core.Configuration;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources;
using DriftWatch.Sources.Postgres;
using Npgsql;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Postgres;

/// <summary>Each failure class, its message naming pair and object, and never a secret in it.</summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresFailureTests(PostgresServer server) : PostgresSourceTestBase(server)
{
    private const string Secret = "pa55-do-not-print";
    private readonly string _role = "dw_noread_" + Guid.NewGuid().ToString("N")[..8];

    protected override Task SeedAsync() => Db.ExecuteAsync("""
        CREATE SCHEMA sales;
        CREATE TABLE sales."Orders" (amount numeric(12, 2), tax numeric(12, 2), note text);
        INSERT INTO sales."Orders" SELECT i, i * 0.2, 'n' || i FROM generate_series(1, 50) AS i;
        CREATE TABLE x (a integer);
        """);

    protected override async Task CleanupAsync()
    {
        await Server.DropDatabaseAsync(Db.ConnectionString);
        await Server.DropRoleAsync(_role);
    }

    private static string WithSecret(string connectionString) => new NpgsqlConnectionStringBuilder(connectionString) { Password = Secret }.ToString();

    private async Task<SourceException> FailAsync(PairConfig pair, string? connectionString = null, TimeSpan? timeout = null)
    {
        await using var source = new PostgresPairSource(PgSource(connectionString ?? WithSecret(Db.ConnectionString), timeout));
        var e = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(pair, Now, CancellationToken.None));
        Assert.DoesNotContain(Secret, e.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("Password", e.Message, StringComparison.OrdinalIgnoreCase);
        Assert.Contains(pair.Name, e.Message, StringComparison.Ordinal);
        return e;
    }

    [Fact]
    public async Task ClosedPort_IsUnreachable()
    {
        // A port that was free a moment ago: bound, read, released.
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        var port = ((IPEndPoint)listener.LocalEndpoint).Port;
        listener.Stop();
        var cs = $"Host=127.0.0.1;Port={port};Username=nobody;Password={Secret};Database=none;Timeout=5";

        var e = await FailAsync(Table("readings"), cs);

        Assert.Equal(SourceFailure.Unreachable, e.Failure);
        Assert.True(e.Message.Contains($"127.0.0.1:{port}", StringComparison.Ordinal), e.Message);
    }

    [Fact]
    public async Task MissingTable_AndMissingSchema_AreMissingTable()
    {
        var table = await FailAsync(Table("no_such_table"));
        var schema = await FailAsync(Table("nowhere.readings"));
        // Names are case-sensitive as written: "orders" is not "Orders".
        var folded = await FailAsync(Table("sales.orders", "amount", "tax"));

        Assert.Equal(SourceFailure.MissingTable, table.Failure);
        Assert.True(table.Message.Contains("no_such_table", StringComparison.Ordinal), table.Message);
        Assert.Equal(SourceFailure.MissingTable, schema.Failure);
        Assert.Equal(SourceFailure.MissingTable, folded.Failure);
    }

    [Fact]
    public async Task MissingColumn_NamesTheColumn()
    {
        var e = await FailAsync(Table("sales.Orders", "amount", "vat"));

        Assert.Equal(SourceFailure.MissingColumn, e.Failure);
        Assert.True(e.Message.Contains("vat", StringComparison.Ordinal), e.Message);
        Assert.True(e.Message.Contains("sales.Orders", StringComparison.Ordinal), e.Message);
    }

    [Fact]
    public async Task TextColumn_IsNonNumeric_NamingTableAndColumn()
    {
        var e = await FailAsync(Table("sales.Orders", "amount", "note"));

        Assert.Equal(SourceFailure.NonNumericColumn, e.Failure);
        Assert.True(e.Message.Contains("column note is text", StringComparison.Ordinal), e.Message);
        Assert.True(e.Message.Contains("table sales.Orders", StringComparison.Ordinal), e.Message);
    }

    [Fact]
    public async Task RoleWithoutSelect_IsPermissionDenied()
    {
        var cs = await Server.CreateRoleAsync(_role, Db.ConnectionString);
        await Db.ExecuteAsync($"GRANT USAGE ON SCHEMA sales TO {_role}");

        var e = await FailAsync(Table("sales.Orders", "amount", "tax"), cs);

        // SQLSTATE 42501 insufficient_privilege.
        Assert.Equal(SourceFailure.PermissionDenied, e.Failure);
        Assert.True(e.Message.Contains("permission denied", StringComparison.Ordinal), e.Message);
        Assert.DoesNotContain($"role-secret-{_role}", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task SlowQuery_HitsTheStatementTimeout()
    {
        var e = await FailAsync(Query("SELECT x, y FROM readings CROSS JOIN LATERAL (SELECT pg_sleep(5)) AS s WHERE id <= 3"), timeout: TimeSpan.FromMilliseconds(200));

        // SQLSTATE 57014 query_canceled, raised by statement_timeout.
        Assert.Equal(SourceFailure.Timeout, e.Failure);
        Assert.True(e.Message.Contains("statement timeout", StringComparison.Ordinal), e.Message);
    }

    [Fact]
    public async Task BrokenFilter_IsAQueryError()
    {
        var e = await FailAsync(Table("readings", where: "id >>> 3"));

        Assert.Equal(SourceFailure.QueryError, e.Failure);
        Assert.True(e.Message.Contains("42883", StringComparison.Ordinal), e.Message);
    }

    [Fact]
    public async Task WindowColumnNotATime_IsAQueryError()
    {
        var e = await FailAsync(Table("readings", window: new WindowSpec("id", TimeSpan.FromHours(1))));

        Assert.Equal(SourceFailure.QueryError, e.Failure);
        Assert.True(e.Message.Contains("window column id is integer", StringComparison.Ordinal), e.Message);
    }

    [Fact]
    public async Task HostileTableName_IsQuotedHarmlessly_AndNothingIsDropped()
    {
        var e = await FailAsync(Table("a\"; drop table x; --"));
        var column = await FailAsync(Table("readings", "x\" FROM readings; DROP TABLE x; --", "y"));

        Assert.Equal(SourceFailure.MissingTable, e.Failure);
        Assert.Equal(SourceFailure.MissingColumn, column.Failure);
        Assert.Equal(0, await Db.ScalarAsync<long>("SELECT count(*) FROM x"));
    }

    [Fact]
    public async Task Validate_AcceptsAGoodPair_AndReportsABadOne()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        await source.ValidateAsync(Table("sales.Orders", "amount", "tax"), CancellationToken.None);
        await source.ValidateAsync(Query("SELECT amount AS a, tax AS b FROM sales.\"Orders\"", "a", "b"), CancellationToken.None);
        var text = await Assert.ThrowsAsync<SourceException>(() => source.ValidateAsync(Table("sales.Orders", "note", "tax"), CancellationToken.None));
        var missing = await Assert.ThrowsAsync<SourceException>(() => source.ValidateAsync(Query("SELECT amount AS a FROM sales.\"Orders\"", "a", "b"), CancellationToken.None));

        Assert.Equal(SourceFailure.NonNumericColumn, text.Failure);
        Assert.Equal(SourceFailure.MissingColumn, missing.Failure);
    }
}
