using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Hosting;
using DriftWatch.IntegrationTests.Alerting;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.IntegrationTests.Sources.Postgres;
using DriftWatch.Monitoring;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>
/// Pairs of one table checked together (<see cref="TableGroups"/>: one shared read) against the oracle of each pair
/// checked alone (<see cref="PairChecker"/> with its own read) on a second store: the same profile, window figures
/// to 1e-9, the same findings, before and after the data change.
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class TableGroupsTests(PostgresServer server) : IDisposable
{
    private static readonly (string X, string Y)[] Columns =
        [("temp_c", "load_kw"), ("humidity", "load_kw"), ("volts", "amps"), ("temp_c", "humidity"), ("amps", "load_kw"), ("noise", "load_kw")];

    private readonly TemporarySqliteStore _groupedStore = new();
    private readonly TemporarySqliteStore _aloneStore = new();

    [Fact]
    public async Task GroupedChecks_GiveEachPairTheResultsOfItsCheckAlone()
    {
        await using var db = await PostgresDatabase.CreateAsync(server);
        // Invented fixture: a substation's readings; load follows temperature, current follows voltage.
        await db.ExecuteAsync("""
            CREATE TABLE meters (temp_c float8, humidity float8, volts float8, amps float8, load_kw float8, noise float8);
            SELECT setseed(0.31);
            INSERT INTO meters
            SELECT t, 40 + t + random() * 20, v, v / 23.0 + random(), 50 + 3 * t + random() * 10, random()
            FROM (SELECT random() * 30 AS t, 220 + random() * 20 AS v FROM generate_series(1, 3000)) s;
            UPDATE meters SET humidity = NULL WHERE temp_c < 0.5;
            """);
        var grouped = Load(db.ConnectionString, _groupedStore);
        var alone = Load(db.ConnectionString, _aloneStore);
        await using var groupedServices = await OneShotServices.StartAsync(grouped, verbose: false, CancellationToken.None);
        await using var aloneServices = await OneShotServices.StartAsync(alone, verbose: false, CancellationToken.None);
        var groups = groupedServices.GetRequiredService<TableGroups>();
        var checker = aloneServices.GetRequiredService<PairChecker>();
        var group = Assert.Single(groups.Split(grouped.Pairs));
        Assert.Equal(Columns.Length, group.Count);

        // First run: the baseline (first_runs: 1). Then a fault: current copies voltage, load's sign flips.
        await CompareAsync();
        await db.ExecuteAsync("UPDATE meters SET amps = volts, load_kw = -load_kw");
        var changed = await CompareAsync();

        Assert.Contains(changed[2].Findings, f => f.Kind == FindingKind.BecamePerfect);
        Assert.Contains(changed[0].Findings, f => f.Kind == FindingKind.SignFlip);

        async Task<IReadOnlyList<PairCheckResult>> CompareAsync()
        {
            var together = await groups.CheckAsync(group, CancellationToken.None);
            // One shared read: every pair's check starts when that read did.
            Assert.Single(together.Select(r => r.StartedAt).Distinct());
            for (var i = 0; i < group.Count; i++)
            {
                var own = await checker.CheckAsync(alone.Pairs[i], CancellationToken.None);
                var shared = together[i];
                Assert.Equal((RunStatus.Succeeded, RunStatus.Succeeded), (own.Status, shared.Status));
                Assert.Equal(StoreJson.Serialize(own.Profile), StoreJson.Serialize(shared.Profile));
                PostgresGroupTests.AssertSameFigures(own.Window!, shared.Window!, own.Pair.Name);
                Assert.Equal(own.Findings.Select(f => (f.Kind, f.Severity, f.Message)), shared.Findings.Select(f => (f.Kind, f.Severity, f.Message)));
                Assert.Equal(own.HasBaseline, shared.HasBaseline);
            }

            return together;
        }
    }

    [Fact]
    public async Task GroupedChecks_SharedReadFails_EachPairIsCheckedAlone()
    {
        await using var db = await PostgresDatabase.CreateAsync(server);
        await db.ExecuteAsync("""
            CREATE TABLE meters (temp_c float8, humidity float8, volts float8, amps float8, load_kw float8, noise float8);
            INSERT INTO meters SELECT i, i * 2 + (i % 5), i, i % 11, i * 3, i % 3 FROM generate_series(1, 500) AS i;
            """);
        var config = Load(db.ConnectionString, _groupedStore, missing: true);
        await using var services = await OneShotServices.StartAsync(config, verbose: false, CancellationToken.None);
        var groups = services.GetRequiredService<TableGroups>();
        var group = Assert.Single(groups.Split(config.Pairs));

        var results = await groups.CheckAsync(group, CancellationToken.None);

        // The missing column fails its own pair only; the others are checked alone and succeed.
        Assert.Equal(RunStatus.Failed, results[^1].Status);
        Assert.Contains("absent", results[^1].Error, StringComparison.Ordinal);
        Assert.All(results.SkipLast(1), r => Assert.Equal(RunStatus.Succeeded, r.Status));
        Assert.Equal(group.Count, results.Select(r => r.StartedAt).Distinct().Count());
    }

    private static DriftWatchConfig Load(string connection, TemporarySqliteStore store, bool missing = false)
    {
        var pairs = Columns.Select(c => (c.X, c.Y)).ToList();
        if (missing)
        {
            pairs.Add(("volts", "absent"));
        }

        var lines = new List<string>
        {
            "sources:", "  - name: plant", "    kind: postgres", "    connection: ${SOURCE_PG}",
            "store:", "  kind: sqlite", "  connection: " + store.DatabasePath,
            "pairs:",
        };
        foreach (var (x, y) in pairs)
        {
            lines.AddRange([$"  - name: meters.{x}_{y}", "    source: plant", "    table: meters", $"    x: {x}", $"    y: {y}",
                "    sample:", "      method: all", "    baseline:", "      first_runs: 1"]);
        }

        var yaml = string.Join("\n", lines) + "\n";
        var result = ConfigLoader.Parse(yaml, "groups.yaml", name => name == "SOURCE_PG" ? connection : null, store.Folder);
        Assert.True(result.Ok, string.Join("\n", result.Errors));
        return result.Config!;
    }

    public void Dispose()
    {
        _groupedStore.Dispose();
        _aloneStore.Dispose();
    }
}
