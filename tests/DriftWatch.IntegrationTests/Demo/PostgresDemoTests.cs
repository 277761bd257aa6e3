using DriftWatch.Cli;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Demo;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Output;
using DriftWatch.Store;
using Microsoft.Data.Sqlite;

namespace DriftWatch.IntegrationTests.Demo;

/// <summary>
/// <c>driftwatch demo --postgres</c> against the real PostgreSQL server: the scenario goes into schema
/// <c>terminal</c> and is watched through a postgres source, with the same checks as the SQLite variant.
/// A scenario test on invented data (allowed for the demo only). Allowed lag: 2 days, as in the SQLite test.
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresDemoTests(PostgresServer server) : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "driftwatch-pgdemo-" + Guid.NewGuid().ToString("N"));

    [Fact]
    public async Task Demo_OnPostgres_CatchesEveryFaultAndKeepsTheControlSilent()
    {
        await using var database = await PostgresDatabase.CreateAsync(server);

        var (exit, output, error) = await RunAsync("demo", "--out", _folder, "--postgres", database.ConnectionString);

        Assert.True(exit == 0, $"exit {exit}\n{output}\n{error}");
        Assert.Contains("PostgreSQL schema terminal", output, StringComparison.Ordinal);

        // The day's loads landed in PostgreSQL: 21 days of crane shifts; the reefer table, renamed on day 19, holds all 21 days under its new name.
        Assert.Equal(21L * TerminalScenario.Cranes.RowsPerDay, await database.ScalarAsync<long>("SELECT count(*) FROM terminal.crane_shifts"));
        Assert.Equal(21L * TerminalScenario.Reefers.RowsPerDay, await database.ScalarAsync<long>("SELECT count(*) FROM terminal.reefer_power_readings"));
        Assert.True(await database.ScalarAsync<bool>("SELECT to_regclass('terminal.reefer_readings') IS NULL"));

        // The configuration names the postgres source by variable; the connection string is not written to the file.
        var yaml = await File.ReadAllTextAsync(Path.Combine(_folder, DemoFolder.ConfigFile));
        Assert.Contains("kind: postgres", yaml, StringComparison.Ordinal);
        Assert.Contains("connection: ${DRIFTWATCH_DEMO_PG}", yaml, StringComparison.Ordinal);
        Assert.DoesNotContain(database.ConnectionString, yaml, StringComparison.Ordinal);

        var runs = await ReadRunsAsync();
        foreach (var (pair, day, kind) in new[]
        {
            ("declared-vs-weighed", 8, FindingKind.BecamePerfect),
            ("truck-km-vs-fuel", 11, FindingKind.SlopeShift),
            ("vessel-teu-vs-discharged", 13, FindingKind.RelationshipLost),
            ("reefer-count-vs-power", 15, FindingKind.OutlierSurge),
            ("yard-occupancy-vs-gate-wait", 17, FindingKind.CurvatureAppeared),
        })
        {
            var first = runs[pair].First(r => r.Findings.Any(f => f.Kind == kind));
            Assert.InRange(DayOf(first.StartedAt), day, day + 2);
        }

        Assert.All(runs[TerminalScenario.Control.Name], r => Assert.Empty(r.Findings));
        Assert.All(runs["reefer-count-vs-power"].Where(r => DayOf(r.StartedAt) >= 19), r =>
        {
            Assert.Equal(RunStatus.Failed, r.Status);
            Assert.Contains("terminal.reefer_readings", r.Error, StringComparison.Ordinal);
        });
    }

    [Fact]
    public async Task Demo_SchemaTerminalNotMadeByTheDemo_IsRefusedAndKept()
    {
        await using var database = await PostgresDatabase.CreateAsync(server);
        await database.ExecuteAsync("CREATE SCHEMA terminal; CREATE TABLE terminal.berths (id int); INSERT INTO terminal.berths VALUES (1), (2)");

        var (exit, _, error) = await RunAsync("demo", "--out", _folder, "--days", "1", "--postgres", database.ConnectionString);

        Assert.Equal(ExitCodes.UsageError, exit);
        Assert.Contains("is not a previous demo's", error, StringComparison.Ordinal);
        Assert.Equal(2L, await database.ScalarAsync<long>("SELECT count(*) FROM terminal.berths"));
    }

    [Fact]
    public async Task Demo_RunTwiceOnTheSameDatabase_ReplacesItsOwnSchema()
    {
        await using var database = await PostgresDatabase.CreateAsync(server);

        var first = await RunAsync("demo", "--out", _folder, "--days", "2", "--postgres", database.ConnectionString);
        var second = await RunAsync("demo", "--out", _folder, "--days", "1", "--postgres", database.ConnectionString);

        Assert.Equal(0, first.Exit);
        Assert.True(second.Exit == 0, second.Error);
        Assert.Equal((long)TerminalScenario.Cranes.RowsPerDay, await database.ScalarAsync<long>("SELECT count(*) FROM terminal.crane_shifts"));
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        if (Directory.Exists(_folder))
        {
            Directory.Delete(_folder, recursive: true);
        }
    }

    private static async Task<(int Exit, string Output, string Error)> RunAsync(params string[] args)
    {
        using var output = new StringWriter();
        using var error = new StringWriter();
        var exit = await CliApp.RunAsync(args, CliConsole.ForWriters(output, error), CancellationToken.None);
        return (exit, output.ToString(), error.ToString());
    }

    private async Task<Dictionary<string, List<RunRecord>>> ReadRunsAsync()
    {
        var history = new HistoryStore(new SqliteStoreDatabase("Data Source=" + Path.Combine(_folder, DemoFolder.StoreFile)));
        var runs = new Dictionary<string, List<RunRecord>>(StringComparer.Ordinal);
        foreach (var pair in TerminalScenario.Pairs)
        {
            runs[pair.Name] = [.. (await history.GetRunsAsync(pair.Name, 100, includePoints: false, CancellationToken.None)).Reverse()];
        }

        return runs;
    }

    private static int DayOf(DateTimeOffset at) => (at.UtcDateTime.Date - new DateTime(2026, 11, 1, 0, 0, 0, DateTimeKind.Utc)).Days + 1;
}
