using DriftWatch.Core.Configuration;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources;
using DriftWatch.Sources.Postgres;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Postgres;

/// <summary>The monitor can never write to the data it watches, whatever a pair's filter or query says.</summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresReadOnlyTests(PostgresServer server) : PostgresSourceTestBase(server)
{
    protected override Task SeedAsync() => Db.ExecuteAsync("""
        CREATE TABLE victim (x float8, y float8);
        INSERT INTO victim SELECT i, i FROM generate_series(1, 100) AS i;
        CREATE SEQUENCE counter;
        CREATE FUNCTION wipe_victim() RETURNS boolean LANGUAGE plpgsql AS $$ BEGIN DELETE FROM victim; RETURN true; END $$;
        """);

    [Fact]
    public async Task Where_CallingAWritingFunction_FailsAsReadOnly_AndTheRowsStay()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var e = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Table("victim", where: "wipe_victim()"), Now, CancellationToken.None));

        // SQLSTATE 25006 read_only_sql_transaction (PostgreSQL manual, appendix A).
        Assert.Equal(SourceFailure.QueryError, e.Failure);
        Assert.True(e.Message.Contains("read-only", StringComparison.Ordinal), e.Message);
        Assert.Equal(100, await Db.ScalarAsync<long>("SELECT count(*) FROM victim"));
    }

    [Fact]
    public async Task Query_WithADataModifyingStatement_Fails_AndTheRowsStay()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(
            Query("WITH d AS (DELETE FROM victim RETURNING x, y) SELECT x, y FROM d"), Now, CancellationToken.None));
        var viaSelect = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(
            Query("SELECT x, y FROM victim WHERE wipe_victim()"), Now, CancellationToken.None));
        var nextval = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(
            Query("SELECT x + nextval('counter') AS x, y FROM victim"), Now, CancellationToken.None));

        Assert.True(viaSelect.Message.Contains("read-only", StringComparison.Ordinal), viaSelect.Message);
        Assert.True(nextval.Message.Contains("read-only", StringComparison.Ordinal), nextval.Message);
        Assert.Equal(100, await Db.ScalarAsync<long>("SELECT count(*) FROM victim"));
    }

    [Theory]
    [InlineData("true); DELETE FROM victim; SELECT (1")]
    [InlineData("true); COMMIT; DELETE FROM victim; SELECT (1")]
    public async Task Where_SmugglingASecondStatement_IsRefusedByTheServer_AndTheRowsStay(string where)
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var e = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Table("victim", where: where), Now, CancellationToken.None));

        // The server refuses more than one statement in a prepared statement (SQLSTATE 42601).
        Assert.True(e.Message.Contains("cannot insert multiple commands", StringComparison.Ordinal), e.Message);
        Assert.Equal(100, await Db.ScalarAsync<long>("SELECT count(*) FROM victim"));
    }

    [Fact]
    public async Task Where_WithABareSemicolon_IsASyntaxErrorInsideItsParentheses_AndTheRowsStay()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var e = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Table("victim", where: "true; DELETE FROM victim"), Now, CancellationToken.None));

        Assert.Equal(SourceFailure.QueryError, e.Failure);
        Assert.True(e.Message.Contains("42601", StringComparison.Ordinal), e.Message);
        Assert.Equal(100, await Db.ScalarAsync<long>("SELECT count(*) FROM victim"));
    }

    [Fact]
    public async Task Session_IsReadOnly_NamedDriftwatch_WithTheConfiguredTimeout()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString, TimeSpan.FromMilliseconds(1500)));
        const string session = "current_setting('transaction_read_only') = 'on' AND current_setting('application_name') = 'driftwatch' " +
                               "AND current_setting('statement_timeout') = '1500ms' AND current_setting('transaction_isolation') = 'repeatable read'";

        var matching = await source.SampleAsync(Table("victim", where: session), Now, CancellationToken.None);
        var control = await source.SampleAsync(Table("victim", where: "current_setting('application_name') = 'something else'"), Now, CancellationToken.None);

        Assert.Equal(100, matching.Sample.UsedCount);
        Assert.Equal(0, control.Sample.UsedCount);
    }

    [Fact]
    public async Task Window_WithSampleRowsAboveTheWindow_ReadsTheWindowWhole()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var result = await source.SampleAsync(Table("readings", window: new WindowSpec("ts", TimeSpan.FromSeconds(10)), sample: new SampleSpec { Method = SampleMethod.Random }), Now, CancellationToken.None);

        Assert.Equal("all 10", result.Method);
        Assert.Equal(Enumerable.Range(86_390, 10).Select(i => (double)i), result.Sample.X.Order());
    }
}
