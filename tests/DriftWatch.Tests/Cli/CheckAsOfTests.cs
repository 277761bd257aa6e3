using System.Globalization;
using System.Text.Json;
using MathNet.Numerics.Statistics;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// <c>check --as-of</c> and <c>window.anchor: latest</c> end to end in-process, on a real SQLite source (one table, a
/// load a day stamped in <c>loaded_at</c>) and a real SQLite store. Oracle for the figures: MathNet.Numerics over the
/// rows of the load the window should hold.
/// </summary>
public sealed class CheckAsOfTests : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-asof-" + Guid.NewGuid().ToString("N"));
    private readonly Dictionary<string, (double[] X, double[] Y)> _loads = [];

    public CheckAsOfTests()
    {
        Directory.CreateDirectory(_folder);
        using var connection = Open();
        Execute(connection, "CREATE TABLE shipments (loaded_at TEXT NOT NULL, crew_hours REAL, pallets REAL)");
        Load("2026-03-01 06:00:00", seed: 1, copy: false);
        Load("2026-03-02 06:00:00", seed: 2, copy: false);
        // The third load's pallets are a copy of crew_hours: became_perfect against the first two.
        Load("2026-03-03 06:00:00", seed: 3, copy: true);
    }

    private string ConfigPath => Path.Combine(_folder, "driftwatch.yaml");

    private void WriteConfig(string anchor, string? where = null) => File.WriteAllText(ConfigPath, $"""
        sources:
          - name: yard
            kind: sqlite
            connection: yard.db
        store:
          connection: store.db
        pairs:
          - name: hours-vs-pallets
            source: yard
            table: shipments
            x: crew_hours
            y: pallets
            window: {"{"}column: loaded_at, last: 1d, anchor: {anchor}{"}"}
            {(where is null ? string.Empty : "where: \"" + where + "\"")}
            sample:
              method: all
            baseline:
              first_runs: 2
        """);

    [Fact]
    public async Task AsOf_AnchorLatest_RecordsBackDatedRunsTheBaselineUses_AndRaisesNoAlertAboutThePast()
    {
        WriteConfig("latest");

        var first = await CliRun.Of("check", "--config", ConfigPath, "--as-of", "2026-03-01T12:00:00Z", "--format", "json");
        await CliRun.Of("check", "--config", ConfigPath, "--as-of", "2026-03-02T14:00:00+02:00");
        var third = await CliRun.Of("check", "--config", ConfigPath, "--as-of", "2026-03-03T12:00:00Z", "--format", "json");

        Assert.Equal(0, first.ExitCode);
        using (var json = JsonDocument.Parse(first.Out))
        {
            var pair = json.RootElement.GetProperty("pairs")[0];
            Assert.True(pair.GetProperty("back_dated").GetBoolean());
            Assert.Equal(new DateTimeOffset(2026, 3, 1, 6, 0, 0, TimeSpan.Zero), pair.GetProperty("window_ended_at").GetDateTimeOffset());
            Assert.Equal(new DateTimeOffset(2026, 3, 1, 12, 0, 0, TimeSpan.Zero), pair.GetProperty("started_at").GetDateTimeOffset());
            // Only the first load is in the window (the later ones are after the as-of time): MathNet over its rows.
            var (x, y) = _loads["2026-03-01 06:00:00"];
            Assert.Equal(x.Length, pair.GetProperty("window").GetProperty("rows").GetInt64());
            Assert.Equal(Correlation.Pearson(x, y), pair.GetProperty("profile").GetProperty("pearson_r").GetDouble(), 12);
        }

        Assert.Equal(1, third.ExitCode);
        using (var json = JsonDocument.Parse(third.Out))
        {
            var pair = json.RootElement.GetProperty("pairs")[0];
            Assert.Contains(pair.GetProperty("findings").EnumerateArray(), f => f.GetProperty("kind").GetString() == "became_perfect");
            // The baseline was pooled from the two back-dated runs before it.
            Assert.Equal(2, pair.GetProperty("judged_against").GetProperty("run_count").GetInt32());
        }

        // Later the same day the newest load is still the third: a repeat of its run, said so, nothing recorded.
        Assert.Contains("same load as run", (await CliRun.Of("check", "--config", ConfigPath, "--as-of", "2026-03-03T18:00:00Z")).Out, StringComparison.Ordinal);

        // Back-dated runs never reach alert evaluation: no alert, so no mail, about the past.
        var alerts = await CliRun.Of("alerts", "list", "--config", ConfigPath, "--format", "json");
        using (var list = JsonDocument.Parse(alerts.Out))
        {
            Assert.Equal(0, list.RootElement.GetProperty("alerts").GetArrayLength());
        }

        var history = await CliRun.Of("history", "hours-vs-pallets", "--config", ConfigPath, "--format", "json");
        using var runs = JsonDocument.Parse(history.Out);
        var recorded = runs.RootElement.GetProperty("runs").EnumerateArray().ToList();
        // Three runs: the fourth check found the load the third had read (a repeat), so it recorded nothing.
        Assert.Equal(3, recorded.Count);
        Assert.All(recorded, r => Assert.NotEqual(JsonValueKind.Null, r.GetProperty("back_dated_at").ValueKind));
        Assert.Equal(
            ["2026-03-03T06:00:00+00:00", "2026-03-02T06:00:00+00:00", "2026-03-01T06:00:00+00:00"],
            recorded.Select(r => r.GetProperty("window_ended_at").GetDateTimeOffset().ToString("yyyy-MM-dd'T'HH:mm:sszzz", CultureInfo.InvariantCulture)));
    }

    [Fact]
    public async Task AnchorLatest_TheSameLoadCheckedAgain_IsARepeatOfItsRun_AndANewLoadIsCheckedAnew()
    {
        WriteConfig("latest");

        var first = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");
        var again = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");
        Load("2026-03-04 06:00:00", seed: 4, copy: false);
        var fresh = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");

        using var a = JsonDocument.Parse(first.Out);
        using var b = JsonDocument.Parse(again.Out);
        using var c = JsonDocument.Parse(fresh.Out);
        var firstPair = a.RootElement.GetProperty("pairs")[0];
        var againPair = b.RootElement.GetProperty("pairs")[0];
        var freshPair = c.RootElement.GetProperty("pairs")[0];
        var firstId = firstPair.GetProperty("run_id").GetInt64();
        Assert.Equal(JsonValueKind.Null, firstPair.GetProperty("repeat_of_run").ValueKind);
        Assert.Equal(firstId, againPair.GetProperty("repeat_of_run").GetInt64());
        Assert.Equal(firstId, againPair.GetProperty("run_id").GetInt64());
        Assert.Equal(new DateTimeOffset(2026, 3, 3, 6, 0, 0, TimeSpan.Zero), againPair.GetProperty("window_ended_at").GetDateTimeOffset());
        Assert.Equal(first.ExitCode, again.ExitCode);
        Assert.Equal(JsonValueKind.Null, freshPair.GetProperty("repeat_of_run").ValueKind);
        Assert.Equal(new DateTimeOffset(2026, 3, 4, 6, 0, 0, TimeSpan.Zero), freshPair.GetProperty("window_ended_at").GetDateTimeOffset());
        // The fresh load alone is in the window: MathNet over its rows.
        var (x, y) = _loads["2026-03-04 06:00:00"];
        Assert.Equal(Correlation.Pearson(x, y), freshPair.GetProperty("profile").GetProperty("pearson_r").GetDouble(), 12);

        var history = await CliRun.Of("history", "hours-vs-pallets", "--config", ConfigPath, "--format", "json");
        using var runs = JsonDocument.Parse(history.Out);
        Assert.Equal(2, runs.RootElement.GetProperty("runs").GetArrayLength());
    }

    [Fact]
    public async Task AnchorLatest_NothingWithinTheFilter_IsUnmeasurableEveryTime_NeverARepeatOrHealthy()
    {
        WriteConfig("latest", where: "crew_hours < 0");

        var first = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");
        var again = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");

        foreach (var run in new[] { first, again })
        {
            Assert.Equal(3, run.ExitCode);
            using var json = JsonDocument.Parse(run.Out);
            var pair = json.RootElement.GetProperty("pairs")[0];
            Assert.Equal("unmeasurable", pair.GetProperty("status").GetString());
            Assert.Equal(JsonValueKind.Null, pair.GetProperty("repeat_of_run").ValueKind);
            Assert.Equal(JsonValueKind.Null, pair.GetProperty("window_ended_at").ValueKind);
        }
    }

    [Theory]
    [InlineData("2026-03-01T12:00:00", "--as-of must be an ISO 8601 date and time with Z or an offset")]
    [InlineData("yesterday", "--as-of must be an ISO 8601 date and time with Z or an offset")]
    [InlineData("2099-01-01T00:00:00Z", "is in the future")]
    public async Task AsOf_WithoutAnOffsetOrInTheFuture_ExitsTwoSayingWhy(string value, string message)
    {
        WriteConfig("now");

        var run = await CliRun.Of("check", "--config", ConfigPath, "--as-of", value);

        Assert.Equal(2, run.ExitCode);
        Assert.Contains(message, run.Error, StringComparison.Ordinal);
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(_folder, recursive: true);
    }

    /// <summary>200 rows stamped <paramref name="at"/>: pallets ≈ 2.5 × crew_hours + 40 with noise, or an exact copy.</summary>
    private void Load(string at, int seed, bool copy)
    {
        var random = new Random(seed);
        double[] x = [.. Enumerable.Range(0, 200).Select(_ => 10 + (random.NextDouble() * 90))];
        double[] y = copy ? [.. x] : [.. x.Select(v => (2.5 * v) + 40 + ((random.NextDouble() - 0.5) * 30))];
        _loads[at] = (x, y);
        using var connection = Open();
        using var transaction = connection.BeginTransaction();
        for (var i = 0; i < x.Length; i++)
        {
            using var insert = connection.CreateCommand();
            insert.CommandText = "INSERT INTO shipments VALUES ($t, $x, $y)";
            insert.Parameters.AddWithValue("$t", at);
            insert.Parameters.AddWithValue("$x", x[i]);
            insert.Parameters.AddWithValue("$y", y[i]);
            insert.ExecuteNonQuery();
        }

        transaction.Commit();
    }

    private SqliteConnection Open()
    {
        var connection = new SqliteConnection($"Data Source={Path.Combine(_folder, "yard.db")}");
        connection.Open();
        return connection;
    }

    private static void Execute(SqliteConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        command.ExecuteNonQuery();
    }
}
