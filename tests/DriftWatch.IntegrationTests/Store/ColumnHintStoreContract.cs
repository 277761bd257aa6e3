using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>
/// Column hints in the store (migration 014): what one shared read learned about a column, read back by the next
/// process. Keys carry whole query texts, so they must work at any length; sources keep their hints apart.
/// </summary>
public abstract class ColumnHintStoreContract : IAsyncLifetime
{
    private static readonly DateTimeOffset At = new(2026, 3, 2, 10, 0, 0, TimeSpan.Zero);

    private readonly IStoreDatabaseFactory _factory;

    private protected ColumnHintStoreContract(IStoreDatabaseFactory factory) => _factory = factory;

    private IStoreDatabase Database { get; set; } = null!;

    public async Task InitializeAsync()
    {
        Database = await _factory.CreateAsync();
        await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    [Fact]
    public async Task Write_ThenRead_GivesBackEveryHint_OverwritesOlderOnes_AndKeepsSourcesApart()
    {
        var longQuery = "(SELECT * FROM meters WHERE note <> '" + new string('x', 5000) + "') q\n\nkwh";
        var store = new ColumnHintStore(Database);
        await store.WriteAsync("plant", new Dictionary<string, ColumnHint>
        {
            ["meters\n\nkwh"] = new(1_000_000_000.25, true),
            ["meters\n\nlitres"] = new(null, false),
            [longQuery] = new(-3.5e-12, true),
        }, At, CancellationToken.None);
        await store.WriteAsync("office", new Dictionary<string, ColumnHint> { ["meters\n\nkwh"] = new(7, false) }, At, CancellationToken.None);

        // A fresh object over the same store: every value exactly, a key never written absent.
        var read = await new ColumnHintStore(Database).ReadAsync("plant", ["meters\n\nkwh", "meters\n\nlitres", longQuery, "meters\n\nnone"], CancellationToken.None);
        Assert.Equal(3, read.Count);
        Assert.Equal(new ColumnHint(1_000_000_000.25, true), read["meters\n\nkwh"]);
        Assert.Equal(new ColumnHint(null, false), read["meters\n\nlitres"]);
        Assert.Equal(new ColumnHint(-3.5e-12, true), read[longQuery]);
        Assert.Equal(new ColumnHint(7, false), (await store.ReadAsync("office", ["meters\n\nkwh"], CancellationToken.None))["meters\n\nkwh"]);

        // A later read replaces the hint.
        await store.WriteAsync("plant", new Dictionary<string, ColumnHint> { ["meters\n\nkwh"] = new(2.5, false) }, At.AddHours(1), CancellationToken.None);
        Assert.Equal(new ColumnHint(2.5, false), (await store.ReadAsync("plant", ["meters\n\nkwh"], CancellationToken.None))["meters\n\nkwh"]);
        Assert.Empty(await store.ReadAsync("plant", [], CancellationToken.None));

        // Retention: hints not refreshed since the cut-off go, the refreshed one stays.
        Assert.Equal(3, await store.PruneAsync(At.AddMinutes(30), CancellationToken.None));
        Assert.Equal(["meters\n\nkwh"], (await store.ReadAsync("plant", ["meters\n\nkwh", "meters\n\nlitres", longQuery], CancellationToken.None)).Keys);
    }
}

public sealed class SqliteColumnHintStoreTests() : ColumnHintStoreContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresColumnHintStoreTests(PostgresServer server) : ColumnHintStoreContract(new PostgresStoreDatabaseFactory(server));
