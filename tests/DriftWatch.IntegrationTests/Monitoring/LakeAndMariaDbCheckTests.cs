using System.Text.Json;
using DriftWatch.Cli;
using DriftWatch.IntegrationTests.Alerting;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Output;
using MathNet.Numerics.Statistics;
using Microsoft.Data.Sqlite;
using MimeKit;
using MySqlConnector;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>
/// <c>driftwatch check</c> (the command, on a configuration file) over a duckdb pair reading a Parquet glob and a mysql
/// pair on the real MariaDB, each beside a healthy control of its kind, with the SQLite store and a real SMTP server:
/// as <see cref="DuplicatedColumnEndToEndTests"/> does for PostgreSQL, a planted fault becomes one critical email with
/// the plot inline, per kind, and the controls stay silent.
/// </summary>
[Collection(UsesMariaDb.Name)]
public sealed class LakeAndMariaDbCheckTests(MariaDbServer server) : IAsyncLifetime
{
    /// <summary>NIST SP 811 (2008), appendix B.8: 1 lb = 0.45359237 kg exactly.</summary>
    private const double KilogramsPerPound = 0.45359237;

    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-lakemaria-" + Guid.NewGuid().ToString("N"));
    private string _mysql = null!;

    public async Task InitializeAsync()
    {
        Directory.CreateDirectory(_folder);
        _mysql = await server.CreateDatabaseAsync();
    }

    public async Task DisposeAsync()
    {
        await server.DropDatabaseAsync(_mysql);
        SqliteConnection.ClearAllPools();
        Directory.Delete(_folder, recursive: true);
    }

    [Fact]
    public async Task Check_ParquetGlobAndMariaDbPairs_PlantedFaultsMailOnceEach_ControlsStaySilent()
    {
        // Two weighings of each parcel (a deterministic ±1 kg scale error) in two Parquet files; the control's
        // pallets the same way with their own numbers.
        WriteLake("parcels", "100 + (i * 37) % 900 + ((i * 7919) % 200 - 100) / 100.0");
        WriteLake("pallets", "100 + (i * 37) % 900 + ((i * 104729) % 300 - 150) / 100.0");
        await MariaDbServer.ExecuteAsync(_mysql, """
            CREATE TABLE parcels (id INT PRIMARY KEY, declared_kg DOUBLE, weighed_kg DOUBLE);
            INSERT INTO parcels SELECT seq, 100 + (seq * 37) % 900, 100 + (seq * 37) % 900 + (CAST((seq * 7919) % 200 AS SIGNED) - 100) / 100.0 FROM seq_1_to_2000;
            CREATE TABLE crates (id INT PRIMARY KEY, declared_kg DOUBLE, weighed_kg DOUBLE);
            INSERT INTO crates SELECT seq, 50 + (seq * 41) % 400, 50 + (seq * 41) % 400 + (CAST((seq * 104729) % 300 AS SIGNED) - 150) / 100.0 FROM seq_1_to_2000;
            """);
        using var smtp = LoopbackSmtp.Start();
        var config = WriteConfig(LoopbackSmtp.Port(smtp));

        // Two healthy checks form every pair's baseline (first_runs: 2): exit 0, no finding of note, no email.
        for (var i = 0; i < 2; i++)
        {
            var healthy = await CheckAsync(config, ExitCodes.Healthy);
            foreach (var pair in new[] { "lake-parcels", "lake-pallets", "maria-parcels", "maria-crates" })
            {
                var row = Pair(healthy, pair);
                Assert.Equal("succeeded", row.GetProperty("status").GetString());
                Assert.Equal(2000, row.GetProperty("profile").GetProperty("n_used").GetInt32());
                AssertQuiet(row);
            }
        }

        Assert.Empty(smtp.ReceivedEmail);

        // Fault 1, the lake: a job now writes the weighed column as pounds computed from the declared kilograms.
        WriteLake("parcels", $"(100 + (i * 37) % 900) / {KilogramsPerPound}");
        var lake = await CheckAsync(config, ExitCodes.Findings);
        var lakeRow = Pair(lake, "lake-parcels");
        var perfect = Assert.Single(lakeRow.GetProperty("findings").EnumerateArray(), f => f.GetProperty("kind").GetString() == "became_perfect");
        Assert.Equal("critical", perfect.GetProperty("severity").GetString());
        var lakeProfile = lakeRow.GetProperty("profile");
        Assert.True(lakeProfile.GetProperty("exact_affine").GetBoolean());
        // y = x / 0.45359237 exactly (NIST SP 811): the fitted slope is the factor, to rounding.
        Assert.Equal(1 / KilogramsPerPound, lakeProfile.GetProperty("slope").GetDouble(), 1e-9);
        AssertQuiet(Pair(lake, "lake-pallets"));
        AssertQuiet(Pair(lake, "maria-crates"));

        var first = Assert.Single(await LoopbackSmtp.WaitForAsync(smtp, 1));
        AssertDigest(first, "DriftWatch · lake-parcels: became perfect (critical)", "weighed_kg");

        // Fault 2, MariaDB: a broken join fills the weighed column from unrelated rows (a seeded RAND(), one value per row).
        await MariaDbServer.ExecuteAsync(_mysql, "UPDATE parcels SET weighed_kg = 100 + RAND(7) * 900");
        var maria = await CheckAsync(config, ExitCodes.Findings);
        var mariaRow = Pair(maria, "maria-parcels");
        var lost = Assert.Single(mariaRow.GetProperty("findings").EnumerateArray(), f => f.GetProperty("kind").GetString() == "relationship_lost");
        Assert.Equal("critical", lost.GetProperty("severity").GetString());
        // The run's r is the table's Pearson r (MathNet over every row; sample.method all), below the
        // no-relationship threshold 0.2 (Thresholds.DefaultNoRelationshipR).
        var (x, y) = await ColumnsAsync("parcels");
        var r = mariaRow.GetProperty("profile").GetProperty("pearson_r").GetDouble();
        Assert.Equal(Correlation.Pearson(x, y), r, 1e-9);
        Assert.InRange(Math.Abs(r), 0, 0.2);
        AssertQuiet(Pair(maria, "lake-pallets"));
        AssertQuiet(Pair(maria, "maria-crates"));

        // One more email: the MariaDB digest. The lake's alert is still open and is not mailed again.
        var messages = await LoopbackSmtp.WaitForAsync(smtp, 2);
        // netDumbster keeps received messages in no particular order: each subject once.
        Assert.Equal(2, messages.Count);
        Assert.Single(messages, m => m.Subject == first.Subject);
        AssertDigest(Assert.Single(messages, m => m.Subject != first.Subject), "DriftWatch · maria-parcels: relationship lost (critical)", "weighed_kg");
        Assert.DoesNotContain(messages, m => m.TextBody!.Contains("lake-pallets", StringComparison.Ordinal) || m.TextBody!.Contains("maria-crates", StringComparison.Ordinal));

        // Failures: the lake's files are gone and the MariaDB table is dropped. Exit 3; each failed run names its pair
        // and what is missing, and the controls are still checked.
        Directory.Delete(Path.Combine(_folder, "lake", "parcels"), recursive: true);
        await MariaDbServer.ExecuteAsync(_mysql, "DROP TABLE parcels");
        var broken = await CheckAsync(config, ExitCodes.RunFailures);
        AssertFailed(Pair(broken, "lake-parcels"), "Pair 'lake-parcels'", "No files found that match the pattern", "lake/parcels/*.parquet");
        AssertFailed(Pair(broken, "maria-parcels"), "Pair 'maria-parcels'", "table parcels", "parcels' doesn't exist");
        AssertQuiet(Pair(broken, "lake-pallets"));
        AssertQuiet(Pair(broken, "maria-crates"));
    }

    private static void AssertFailed(JsonElement pair, params string[] parts)
    {
        Assert.Equal("failed", pair.GetProperty("status").GetString());
        var error = pair.GetProperty("error").GetString()!;
        Assert.All(parts, part => Assert.Contains(part, error, StringComparison.Ordinal));
        Assert.DoesNotContain('\n', error);
    }

    private void WriteLake(string name, string weighed) =>
        ParquetFiles.Write(
            Path.Combine(_folder, "lake", name),
            [.. new[] { "range(1, 1001)", "range(1001, 2001)" }.Select(range =>
                $"SELECT CAST(100 + (i * 37) % 900 AS DOUBLE) AS declared_kg, CAST({weighed} AS DOUBLE) AS weighed_kg FROM {range} t(i)")]);

    private string WriteConfig(int smtpPort)
    {
        var path = Path.Combine(_folder, "driftwatch.yaml");
        File.WriteAllText(path, $$"""
            sources:
              - name: lake
                kind: duckdb
              - name: shop
                kind: mysql
            {{MySqlSourceYaml.Lines(_mysql, _folder, "mysql.secret")}}
            store:
              kind: sqlite
              connection: store.db
            defaults:
              sample:
                method: all
              baseline:
                first_runs: 2
            pairs:
              - name: lake-parcels
                source: lake
                table: 'lake/parcels/*.parquet'
                x: declared_kg
                y: weighed_kg
              - name: lake-pallets
                source: lake
                table: 'lake/pallets/*.parquet'
                x: declared_kg
                y: weighed_kg
              - name: maria-parcels
                source: shop
                table: parcels
                x: declared_kg
                y: weighed_kg
              - name: maria-crates
                source: shop
                table: crates
                x: declared_kg
                y: weighed_kg
            alerting:
              smtp:
                host: 127.0.0.1
                port: {{smtpPort}}
                security: none
                from: driftwatch@example.test
              mailing_lists:
                - name: oncall
                  recipients: [oncall@example.test]
                  from_severity: warning
            """);
        return path;
    }

    /// <summary>Runs <c>driftwatch check --config … --format json</c> and returns its JSON after checking the exit code.</summary>
    private static async Task<JsonElement> CheckAsync(string config, int expectedExit)
    {
        using var output = new StringWriter();
        using var error = new StringWriter();
        var exit = await CliApp.RunAsync(["check", "--config", config, "--format", "json"], CliConsole.ForWriters(output, error), CancellationToken.None);
        Assert.True(exit == expectedExit, $"exit {exit}, expected {expectedExit}\n{output}\n{error}");
        using var document = JsonDocument.Parse(output.ToString());
        return document.RootElement.Clone();
    }

    private static JsonElement Pair(JsonElement check, string name) =>
        Assert.Single(check.GetProperty("pairs").EnumerateArray(), p => p.GetProperty("pair").GetString() == name);

    private static void AssertQuiet(JsonElement pair)
    {
        Assert.Equal("succeeded", pair.GetProperty("status").GetString());
        Assert.DoesNotContain(pair.GetProperty("findings").EnumerateArray(), f => f.GetProperty("severity").GetString() is "warning" or "critical");
    }

    private static void AssertDigest(MimeMessage message, string subject, string column)
    {
        Assert.Equal(subject, message.Subject);
        Assert.Equal("oncall@example.test", Assert.Single(message.To.Mailboxes).Address);
        var image = Assert.Single(message.BodyParts.OfType<MimePart>(), p => p.ContentType.MimeType == "image/png");
        Assert.Contains("cid:" + image.ContentId, message.HtmlBody!, StringComparison.Ordinal);
        using var png = new MemoryStream();
        image.Content!.DecodeTo(png);
        // The PNG signature (ISO/IEC 15948, section 5.2).
        Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, png.ToArray()[..8]);
        Assert.Contains(column, message.TextBody!, StringComparison.Ordinal);
        // The cautions every alert carries (docs/alerting.md).
        Assert.Contains("statistical signals, not proof", message.TextBody!, StringComparison.Ordinal);
        Assert.Contains("sampled data values out of the database", message.TextBody!, StringComparison.Ordinal);
    }

    private async Task<(double[] X, double[] Y)> ColumnsAsync(string table)
    {
        await using var connection = new MySqlConnection(_mysql);
        await connection.OpenAsync();
        await using var command = new MySqlCommand($"SELECT declared_kg, weighed_kg FROM {table}", connection);
        await using var reader = await command.ExecuteReaderAsync();
        var (x, y) = (new List<double>(), new List<double>());
        while (await reader.ReadAsync())
        {
            x.Add(reader.GetDouble(0));
            y.Add(reader.GetDouble(1));
        }

        return ([.. x], [.. y]);
    }
}
