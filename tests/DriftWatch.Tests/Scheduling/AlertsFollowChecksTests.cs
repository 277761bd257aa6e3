using DriftWatch.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Hosting;
using DriftWatch.Store;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.DependencyInjection;

namespace DriftWatch.Tests.Scheduling;

/// <summary>
/// The real worker host (Quartz, SQLite source and store): a pair's check fires alert evaluation at once, so alert
/// states, and the /metrics gauge read from them, follow the checks instead of the alert job's interval.
/// </summary>
public sealed class AlertsFollowChecksTests : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-follow-" + Guid.NewGuid().ToString("N"));

    [Fact]
    public async Task EachCheck_IsJudgedRightAway_EvenWhenTheAlertIntervalIsAnHour()
    {
        Directory.CreateDirectory(_folder);
        using (var connection = new SqliteConnection($"Data Source={Path.Combine(_folder, "source.db")}"))
        {
            connection.Open();
            using var command = connection.CreateCommand();
            // y is copied from x on every row: perfect_relationship on its own profile, a warning (common practice:
            // a copied column is a derived one); a warning is confirmed after two runs in a row by default.
            command.CommandText = "CREATE TABLE t (a REAL, b REAL); WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n WHERE i < 50) INSERT INTO t SELECT i, i FROM n;";
            command.ExecuteNonQuery();
        }

        var yaml = $"""
            sources:
              - name: src
                kind: sqlite
                connection: source.db
            store:
              connection: store.db
            pairs:
              - name: a-vs-b
                source: src
                table: t
                x: a
                y: b
                schedule: "* * * * * ?"
            dashboard:
              enabled: false
            """;
        var loaded = ConfigLoader.Parse(yaml, "worker.yaml", _ => null, _folder);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));

        // The interval job fires once at start (before any run exists) and then not for an hour: only the checks
        // themselves can bring their runs to the alert lifecycle within this test.
        await using var app = WorkerHost.Build(loaded.Config!, new WorkerHostOptions { AlertEvery = TimeSpan.FromHours(1) });
        await app.StartAsync();
        var alerts = app.Services.GetRequiredService<IAlertStore>();
        Core.Alerting.AlertState? alert = null;
        for (var i = 0; i < 300 && alert is not { ConsecutiveRuns: >= 2 }; i++)
        {
            alert = (await alerts.GetOpenAlertsAsync(["a-vs-b"], CancellationToken.None)).SingleOrDefault(a => a.Kind == FindingKind.PerfectRelationship);
            await Task.Delay(100);
        }

        await app.StopAsync();

        Assert.NotNull(alert);
        // Two runs in a row carried the kind, each judged after its own check: the second confirms the warning.
        Assert.True(alert.ConsecutiveRuns >= 2, $"the alert saw {alert.ConsecutiveRuns} run(s)");
        Assert.Equal(Core.Alerting.AlertStatus.Confirmed, alert.Status);
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(_folder, recursive: true);
    }
}
