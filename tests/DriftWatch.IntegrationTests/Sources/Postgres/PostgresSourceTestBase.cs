using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.IntegrationTests.Sources.Postgres;

/// <summary>
/// One database per test class holding generated readings: row i (1..200 000) has x = i, y = 3i + (i mod 7)
/// and ts = 2026-03-01 00:00 UTC + i seconds. Every sampled point can thus be checked against its row.
/// </summary>
public abstract class PostgresSourceTestBase(PostgresServer server) : IAsyncLifetime
{
    public const int ReadingRows = 200_000;

    protected PostgresServer Server { get; } = server;

    protected PostgresDatabase Db { get; private set; } = null!;

    public async Task InitializeAsync()
    {
        Db = await PostgresDatabase.CreateAsync(Server);
        await Db.ExecuteAsync($"""
            CREATE TABLE readings (id integer PRIMARY KEY, x float8, y float8, ts timestamptz NOT NULL, label text);
            INSERT INTO readings
            SELECT i, i, 3 * i + (i % 7), timestamptz '2026-03-01 00:00:00+00' + i * interval '1 second', 'r' || i
            FROM generate_series(1, {ReadingRows}) AS i;
            ANALYZE readings;
            """);
        await SeedAsync();
    }

    public async Task DisposeAsync()
    {
        await CleanupAsync();
        await Db.DisposeAsync();
    }

    protected virtual Task SeedAsync() => Task.CompletedTask;

    protected virtual Task CleanupAsync() => Task.CompletedTask;

    /// <summary>Every point is a real row: y = 3x + (x mod 7), x an integer in 1..200 000, no row twice.</summary>
    protected static void AssertRealDistinctRows(Core.Profiling.PairedSample sample)
    {
        for (var i = 0; i < sample.UsedCount; i++)
        {
            var x = sample.X[i];
            Assert.InRange(x, 1, ReadingRows);
            Assert.Equal(Math.Floor(x), x);
            Assert.Equal((3 * x) + (x % 7), sample.Y[i]);
        }

        Assert.Equal(sample.UsedCount, sample.X.Distinct().Count());
    }
}
