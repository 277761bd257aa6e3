using DriftWatch.Core.Alerting;
using DriftWatch.Core.History;
using DriftWatch.Demo;
using DriftWatch.Store;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Tests.Demo;

/// <summary>
/// Reads a finished demo's store on its own (not through the demo's summary), so the tests check what was
/// actually recorded: every run of every pair, oldest first, and every alert.
/// </summary>
internal sealed record DemoStoreReader(IReadOnlyDictionary<string, IReadOnlyList<RunRecord>> Runs, IReadOnlyList<AlertState> Alerts)
{
    public static async Task<DemoStoreReader> ReadAsync(string folder)
    {
        var database = new SqliteStoreDatabase("Data Source=" + Path.Combine(folder, DemoFolder.StoreFile));
        try
        {
            var history = new HistoryStore(database);
            var runs = new Dictionary<string, IReadOnlyList<RunRecord>>(StringComparer.Ordinal);
            foreach (var pair in TerminalScenario.Pairs)
            {
                var newestFirst = await history.GetRunsAsync(pair.Name, 1000, includePoints: false, CancellationToken.None);
                runs[pair.Name] = [.. newestFirst.Reverse()];
            }

            var alerts = await new AlertStore(database).ListAlertsAsync(DateTimeOffset.UnixEpoch, 1000, CancellationToken.None);
            return new DemoStoreReader(runs, alerts);
        }
        finally
        {
            SqliteConnection.ClearAllPools();
        }
    }

    /// <summary>The run of a pair on a simulated day (day 1 = 2026-11-01); the demo checks once a day.</summary>
    public RunRecord On(string pair, int day) =>
        Assert.Single(Runs[pair], r => r.StartedAt.UtcDateTime.Date == new DateTime(2026, 11, 1, 0, 0, 0, DateTimeKind.Utc).AddDays(day - 1));

    public static int DayOf(DateTimeOffset at) => (at.UtcDateTime.Date - new DateTime(2026, 11, 1, 0, 0, 0, DateTimeKind.Utc)).Days + 1;
}
