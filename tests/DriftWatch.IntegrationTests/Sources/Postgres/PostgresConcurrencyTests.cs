using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources.Postgres;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Postgres;

[Collection(UsesPostgres.Name)]
public sealed class PostgresConcurrencyTests(PostgresServer server) : PostgresSourceTestBase(server)
{
    [Fact]
    public async Task MaxConcurrentQueries_One_ChecksOfTheSourceNeverOverlap()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString) with { MaxConcurrentQueries = 1 });
        // Each statement sleeps, then keeps its rows only if it is the one active driftwatch session in this
        // database (pg_stat_activity, seen by the server itself). Four checks started together would overlap
        // during the sleeps without the limit.
        var pair = Query("""
            SELECT r.x, r.y FROM (SELECT pg_sleep(0.2)) AS s, readings AS r
            WHERE r.id <= 50 AND (SELECT count(*) FROM pg_stat_activity
                                  WHERE application_name = 'driftwatch' AND state = 'active' AND datname = current_database()) = 1
            """);

        var results = await Task.WhenAll(Enumerable.Range(0, 4).Select(_ => source.SampleAsync(pair, Now, CancellationToken.None)));

        Assert.All(results, r => Assert.Equal(50, r.Sample.UsedCount));
        Assert.All(results, r => Assert.Equal(50, r.Figures!.RowCount));
    }
}
