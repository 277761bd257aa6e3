using System.Text.Json;
using MathNet.Numerics.Statistics;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// <c>check</c>, <c>history</c> and <c>baseline</c> end to end in-process, on a real SQLite source and a
/// real SQLite store in a temporary folder. Expected figures come from MathNet.Numerics as an independent oracle.
/// </summary>
public sealed class CheckCommandTests : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-check-" + Guid.NewGuid().ToString("N"));
    private readonly double[] _x;
    private readonly double[] _y;

    public CheckCommandTests()
    {
        Directory.CreateDirectory(_folder);
        var random = new Random(20261202);
        _x = [.. Enumerable.Range(0, 400).Select(_ => 10 + (random.NextDouble() * 90))];
        _y = [.. _x.Select(v => (2.5 * v) + 40 + ((random.NextDouble() - 0.5) * 30))];
        using var connection = Open();
        Execute(connection, "CREATE TABLE shifts (crew_hours REAL, pallets REAL)");
        using var transaction = connection.BeginTransaction();
        for (var i = 0; i < _x.Length; i++)
        {
            using var insert = connection.CreateCommand();
            insert.CommandText = "INSERT INTO shifts VALUES ($x, $y)";
            insert.Parameters.AddWithValue("$x", _x[i]);
            insert.Parameters.AddWithValue("$y", _y[i]);
            insert.ExecuteNonQuery();
        }

        transaction.Commit();
        File.WriteAllText(ConfigPath, """
            sources:
              - name: floor
                kind: sqlite
                connection: floor.db
            store:
              connection: store.db
            pairs:
              - name: hours-vs-pallets
                source: floor
                table: shifts
                x: crew_hours
                y: pallets
                sample:
                  method: all
                baseline:
                  first_runs: 2
            """);
    }

    private string ConfigPath => Path.Combine(_folder, "driftwatch.yaml");

    [Fact]
    public async Task Check_HealthyPair_ExitsZeroAndReportsThePearsonROfAllRows()
    {
        var run = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");

        Assert.Equal(0, run.ExitCode);
        using var json = JsonDocument.Parse(run.Out);
        var pair = json.RootElement.GetProperty("pairs")[0];
        Assert.Equal("succeeded", pair.GetProperty("status").GetString());
        var profile = pair.GetProperty("profile");
        Assert.Equal(_x.Length, profile.GetProperty("n_used").GetInt32());
        // Oracle: MathNet.Numerics' Pearson over the same 400 rows.
        Assert.Equal(Correlation.Pearson(_x, _y), profile.GetProperty("pearson_r").GetDouble(), 12);

        // The window's exact figures come from SQLite's own aggregate over the table; MathNet is the oracle for r.
        var window = pair.GetProperty("window");
        Assert.Equal(_x.Length, window.GetProperty("rows").GetInt64());
        Assert.Equal(Correlation.Pearson(_x, _y), window.GetProperty("pearson_r").GetDouble(), 9);
        Assert.Equal(JsonValueKind.Null, pair.GetProperty("judged_against").ValueKind);
    }

    [Fact]
    public async Task Check_AfterTheBaseline_RecordsTheBaselineItWasJudgedAgainst()
    {
        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);
        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);

        var run = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");

        Assert.Equal(0, run.ExitCode);
        using var json = JsonDocument.Parse(run.Out);
        var judged = json.RootElement.GetProperty("pairs")[0].GetProperty("judged_against");
        Assert.Equal(2, judged.GetProperty("run_count").GetInt32());

        // Both baseline runs read the same 400 rows: their mean r is MathNet's r of those rows.
        Assert.Equal(Correlation.Pearson(_x, _y), judged.GetProperty("pearson_r").GetDouble(), 9);
        Assert.Equal(_x.Length, judged.GetProperty("rows").GetDouble(), 9);

        var history = await CliRun.Of("history", "hours-vs-pallets", "--config", ConfigPath, "--format", "json");
        using var runs = JsonDocument.Parse(history.Out);
        Assert.Equal(2, runs.RootElement.GetProperty("runs")[0].GetProperty("judged_against").GetProperty("run_count").GetInt32());
    }

    [Fact]
    public async Task Check_ColumnCopiedAfterBaseline_ExitsOneWithBecamePerfect()
    {
        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);
        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);
        using (var connection = Open())
        {
            Execute(connection, "UPDATE shifts SET pallets = crew_hours");
        }

        var run = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");

        Assert.Equal(1, run.ExitCode);
        using var json = JsonDocument.Parse(run.Out);
        var findings = json.RootElement.GetProperty("pairs")[0].GetProperty("findings").EnumerateArray().ToList();
        var perfect = Assert.Single(findings, f => f.GetProperty("kind").GetString() == "became_perfect");
        Assert.Equal("critical", perfect.GetProperty("severity").GetString());

        var history = await CliRun.Of("history", "hours-vs-pallets", "--config", ConfigPath, "--format", "json");
        Assert.Equal(0, history.ExitCode);
        using var runs = JsonDocument.Parse(history.Out);
        Assert.Equal(3, runs.RootElement.GetProperty("runs").GetArrayLength());
        Assert.True(runs.RootElement.GetProperty("runs")[0].GetProperty("profile").GetProperty("exact_identity").GetBoolean());
    }

    [Fact]
    public async Task BaselineAccept_AfterIntentionalChange_StopsTheFinding()
    {
        await CliRun.Of("check", "--config", ConfigPath);
        await CliRun.Of("check", "--config", ConfigPath);
        using (var connection = Open())
        {
            // An intentional re-modelling: pallets now counted in half-pallet units (y doubles).
            Execute(connection, "UPDATE shifts SET pallets = pallets * 2");
        }

        Assert.Equal(1, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);
        // The latest run carries the change's findings: adopting it needs --force (exit 1 without).
        Assert.Equal(1, (await CliRun.Of("baseline", "accept", "hours-vs-pallets", "--config", ConfigPath)).ExitCode);
        var accept = await CliRun.Of("baseline", "accept", "hours-vs-pallets", "--force", "--config", ConfigPath);
        Assert.Equal(0, accept.ExitCode);
        Assert.Contains("accepted", accept.Out, StringComparison.Ordinal);

        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);
    }

    [Fact]
    public async Task Check_MissingTable_ExitsThreeNamingTheTableAndRecordsAFailedRun()
    {
        using (var connection = Open())
        {
            Execute(connection, "ALTER TABLE shifts RENAME TO shifts_v2");
        }

        var run = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");

        Assert.Equal(3, run.ExitCode);
        using var json = JsonDocument.Parse(run.Out);
        var pair = json.RootElement.GetProperty("pairs")[0];
        Assert.Equal("failed", pair.GetProperty("status").GetString());
        Assert.Contains("shifts", pair.GetProperty("error").GetString(), StringComparison.Ordinal);
        var history = await CliRun.Of("history", "hours-vs-pallets", "--config", ConfigPath, "--format", "json");
        using var runs = JsonDocument.Parse(history.Out);
        Assert.Equal("failed", runs.RootElement.GetProperty("runs")[0].GetProperty("status").GetString());
    }

    [Fact]
    public async Task Check_EmptyTableAfterACriticalAlert_ExitsThreeUnmeasurableAndTheAlertStaysOpen()
    {
        // Baseline of two healthy runs, then y becomes a copy of x: became_perfect, critical, confirmed at once.
        await CliRun.Of("check", "--config", ConfigPath);
        await CliRun.Of("check", "--config", ConfigPath);
        using (var connection = Open())
        {
            Execute(connection, "UPDATE shifts SET pallets = crew_hours");
        }

        Assert.Equal(1, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);
        using (var connection = Open())
        {
            // The load of the window is late: the table is empty. SQLite's own count says so.
            Execute(connection, "DELETE FROM shifts");
            using var count = connection.CreateCommand();
            count.CommandText = "SELECT COUNT(*) FROM shifts";
            Assert.Equal(0L, (long)count.ExecuteScalar()!);
        }

        var run = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");

        Assert.Equal(3, run.ExitCode);
        using var json = JsonDocument.Parse(run.Out);
        Assert.Equal(3, json.RootElement.GetProperty("exit_code").GetInt32());
        var pair = json.RootElement.GetProperty("pairs")[0];
        Assert.Equal("unmeasurable", pair.GetProperty("status").GetString());
        Assert.Equal("No rows in the window: there is nothing to measure of pallets against crew_hours.", pair.GetProperty("error").GetString());
        Assert.Equal(0, pair.GetProperty("profile").GetProperty("n_rows").GetInt32());
        Assert.Equal(0, pair.GetProperty("findings").GetArrayLength());
        Assert.True(pair.GetProperty("has_baseline").GetBoolean(), "the stored baseline is still there, only not compared");

        var alerts = await CliRun.Of("alerts", "list", "--config", ConfigPath, "--format", "json");
        using var list = JsonDocument.Parse(alerts.Out);
        var all = list.RootElement.GetProperty("alerts").EnumerateArray().ToList();
        var perfect = Assert.Single(all, a => a.GetProperty("kind").GetString() == "became_perfect");
        Assert.Equal("critical", perfect.GetProperty("severity").GetString());
        Assert.Equal("confirmed", perfect.GetProperty("status").GetString());
        Assert.Equal(JsonValueKind.Null, perfect.GetProperty("cleared_at").ValueKind);
        var failing = Assert.Single(all, a => a.GetProperty("kind").GetString() == "check_failing");
        Assert.Equal("watching", failing.GetProperty("status").GetString());
        Assert.Contains("could not measure the pair: No rows in the window", failing.GetProperty("message").GetString(), StringComparison.Ordinal);

        var history = await CliRun.Of("history", "hours-vs-pallets", "--config", ConfigPath, "--format", "json");
        using var runs = JsonDocument.Parse(history.Out);
        var latest = runs.RootElement.GetProperty("runs")[0];
        Assert.Equal("unmeasurable", latest.GetProperty("status").GetString());
        Assert.StartsWith("No rows in the window", latest.GetProperty("error").GetString(), StringComparison.Ordinal);
        var table = await CliRun.Of("history", "hours-vs-pallets", "--config", ConfigPath);
        Assert.Contains("unmeasurable", table.Out, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Check_ConstantColumn_ExitsThreeSayingTheValueAndBuildsNoBaseline()
    {
        using (var connection = Open())
        {
            // A column never filled in: every pallets value is 0.
            Execute(connection, "UPDATE shifts SET pallets = 0");
        }

        var first = await CliRun.Of("check", "--config", ConfigPath);
        var second = await CliRun.Of("check", "--config", ConfigPath, "--format", "json");

        Assert.Equal(3, first.ExitCode);
        Assert.Contains("unmeasurable", first.Out, StringComparison.Ordinal);
        var row = Assert.Single(first.Out.Split('\n'), l => l.Contains("hours-vs-pallets", StringComparison.Ordinal) && l.Contains('│'));
        Assert.DoesNotContain(" ok", row, StringComparison.Ordinal);
        using var json = JsonDocument.Parse(second.Out);
        var pair = json.RootElement.GetProperty("pairs")[0];
        Assert.Equal("unmeasurable", pair.GetProperty("status").GetString());
        Assert.Equal($"pallets is constant (0) in all {_x.Length} usable rows: the correlation of pallets with crew_hours is undefined.", pair.GetProperty("error").GetString());
        Assert.Equal(_x.Length, pair.GetProperty("profile").GetProperty("n_used").GetInt32());
        Assert.False(pair.GetProperty("has_baseline").GetBoolean());
        // first_runs: 2, yet two unmeasurable runs made no baseline.
        var baseline = await CliRun.Of("baseline", "show", "hours-vs-pallets", "--config", ConfigPath);
        Assert.Contains("'hours-vs-pallets' has no baseline yet", baseline.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task BaselineShow_ListsEachPooledRunAndTheSpreadBetweenThem()
    {
        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);
        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);
        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath)).ExitCode);

        var show = await CliRun.Of("baseline", "show", "hours-vs-pallets", "--config", ConfigPath);

        Assert.Equal(0, show.ExitCode);
        Assert.Contains("2 pooled runs", show.Out, StringComparison.Ordinal);

        // Both pooled runs read the same 400 rows, so the spread between them is 0 and their r is MathNet's r.
        var runRows = show.Out.Split('\n').Where(l => l.Contains("│ 400 ", StringComparison.Ordinal)).ToArray();
        Assert.Equal(2, runRows.Length);
        Assert.Contains(DriftWatch.Output.Figures.Number(Correlation.Pearson(_x, _y)), runRows[0], StringComparison.Ordinal);
        var spread = Assert.Single(show.Out.Split('\n'), l => l.Contains("spread (SD)", StringComparison.Ordinal));
        Assert.Contains("│ 0 ", spread, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Check_BadConfiguration_ExitsTwoWithFileLineAndKey()
    {
        File.WriteAllText(ConfigPath, File.ReadAllText(ConfigPath).Replace("    x: crew_hours", "    x: crew_hours\n    smaple:\n      rows: 100", StringComparison.Ordinal));

        var run = await CliRun.Of("check", "--config", ConfigPath);

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("driftwatch.yaml:", run.Error, StringComparison.Ordinal);
        Assert.Contains("smaple", run.Error, StringComparison.Ordinal);
        Assert.Contains("sample", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Check_UnknownPairName_ExitsTwoWithAHint()
    {
        var run = await CliRun.Of("check", "--config", ConfigPath, "--pair", "hours-vs-palets");

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("did you mean 'hours-vs-pallets'", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Check_StoreUnreachable_ExitsThreeWithOneLineAndNoPassword()
    {
        // Port 1 on loopback: nothing listens there (common practice for "connection refused" tests).
        File.WriteAllText(ConfigPath, File.ReadAllText(ConfigPath).Replace(
            "store:\n  connection: store.db",
            "store:\n  kind: postgres\n  connection: Host=127.0.0.1;Port=1;Username=dw;Password=hunter2-secret;Database=dw",
            StringComparison.Ordinal));

        var run = await CliRun.Of("check", "--config", ConfigPath);

        Assert.Equal(3, run.ExitCode);
        Assert.Contains("store could not be opened", run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("hunter2-secret", run.Error + run.Out, StringComparison.Ordinal);
    }

    private SqliteConnection Open()
    {
        var connection = new SqliteConnection($"Data Source={Path.Combine(_folder, "floor.db")};Pooling=False");
        connection.Open();
        return connection;
    }

    private static void Execute(SqliteConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        command.ExecuteNonQuery();
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(_folder, recursive: true);
    }
}
