using System.Globalization;
using System.Text.Json;
using DriftWatch.IntegrationTests.Alerting;
using DriftWatch.IntegrationTests.Infrastructure;
using MathNet.Numerics.Statistics;
using Microsoft.Data.Sqlite;
using MimeKit;
using MySqlConnector;
using netDumbster.smtp;

namespace DriftWatch.IntegrationTests.Hosting;

/// <summary>
/// <c>driftwatch run</c> as a real process (<see cref="WorkerProcess"/>) with a duckdb pair over a Parquet glob and a
/// mysql pair on the real MariaDB, each scheduled every second, beside two that fail: a glob matching no file and a
/// MariaDB table dropped while the worker runs. Both kinds record their runs, the failures are failed runs naming the
/// pair and what is missing, the other pairs go on, and /healthz, the overview, the pair pages and the JSON API show it.
/// </summary>
[Collection(UsesMariaDb.Name)]
public sealed class LakeAndMariaDbWorkerTests(MariaDbServer server) : IAsyncLifetime
{
    // Anscombe (1973), "Graphs in statistical analysis", Table 1 (values from memory): sets I and II share x, and every
    // set has r = 0.816, slope 0.500 and intercept 3.00 to the published digits.
    private static readonly double[] X = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    private static readonly double[] SetI = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    private static readonly double[] SetII = [9.14, 8.14, 8.74, 8.77, 9.26, 8.10, 6.13, 3.10, 9.13, 7.26, 4.74];

    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-lakemaria-run-" + Guid.NewGuid().ToString("N"));
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
    public async Task Run_ParquetGlobAndMariaDbPairs_AreScheduledShownAndSurviveMissingFilesAndADroppedTable()
    {
        // Set I in two Parquet files (rows 1–6 and 7–11), set II in a MariaDB table; set I again in the table to be dropped.
        ParquetFiles.Write(
            Path.Combine(_folder, "anscombe"),
            $"SELECT CAST(x AS DOUBLE) AS x, CAST(y AS DOUBLE) AS y FROM (VALUES {Values(SetI, 0, 6)}) AS t(x, y)",
            $"SELECT CAST(x AS DOUBLE) AS x, CAST(y AS DOUBLE) AS y FROM (VALUES {Values(SetI, 6, 11)}) AS t(x, y)");
        await MariaDbServer.ExecuteAsync(_mysql, $"""
            CREATE TABLE anscombe (x DOUBLE, y DOUBLE);
            INSERT INTO anscombe VALUES {Values(SetII, 0, 11)};
            CREATE TABLE doomed (x DOUBLE, y DOUBLE);
            INSERT INTO doomed VALUES {Values(SetI, 0, 11)};
            """);
        var port = LoopbackSmtp.FreePort();
        using var smtp = LoopbackSmtp.Start();
        var config = WriteConfig(port, LoopbackSmtp.Port(smtp));
        using var client = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}") };

        using var worker = WorkerProcess.Start(config);
        await UntilAsync(client, worker, "lake-anscombe", runs => runs.Any(Succeeded));
        await UntilAsync(client, worker, "maria-anscombe", runs => runs.Any(Succeeded));
        await UntilAsync(client, worker, "maria-doomed", runs => runs.Any(Succeeded));
        var missing = await UntilAsync(client, worker, "lake-missing", runs => runs.Any(Failed));

        // A glob that matches no file: a failed run naming the pair and the glob, at every check.
        var noFiles = missing.First(Failed).GetProperty("error").GetString()!;
        Assert.Contains("Pair 'lake-missing'", noFiles, StringComparison.Ordinal);
        Assert.Contains("No files found that match the pattern", noFiles, StringComparison.Ordinal);
        Assert.Contains("nowhere/*.parquet", noFiles, StringComparison.Ordinal);
        // One line: not the SQL DriftWatch built around the glob (DuckDB appends it as "LINE 1: …").
        Assert.DoesNotContain('\n', noFiles);
        Assert.DoesNotContain(missing, Succeeded);

        // The table is dropped under the running worker: the pair's next check fails and names the table.
        await MariaDbServer.ExecuteAsync(_mysql, "DROP TABLE doomed");
        var doomed = await UntilAsync(client, worker, "maria-doomed", runs => runs.Any(Failed));
        var dropped = doomed.First(Failed);
        var droppedError = dropped.GetProperty("error").GetString()!;
        Assert.Contains("Pair 'maria-doomed'", droppedError, StringComparison.Ordinal);
        Assert.Contains("doomed' doesn't exist", droppedError, StringComparison.Ordinal);
        if (new MySqlConnectionStringBuilder(_mysql).Password is { Length: > 0 } password)
        {
            Assert.DoesNotContain(password, droppedError, StringComparison.Ordinal);
        }

        // The worker goes on: both healthy pairs record runs started after that failure ended.
        var failedAt = dropped.GetProperty("finished_at").GetDateTimeOffset();
        var lake = await UntilAsync(client, worker, "lake-anscombe", runs => runs.Any(r => Succeeded(r) && StartedAt(r) > failedAt));
        var maria = await UntilAsync(client, worker, "maria-anscombe", runs => runs.Any(r => Succeeded(r) && StartedAt(r) > failedAt));
        Assert.All(lake, r => Assert.True(Succeeded(r), r.ToString()));
        Assert.All(maria, r => Assert.True(Succeeded(r), r.ToString()));

        // Each kind's figures: the published ones, and the exact ones of the same rows (MathNet; DuckDB's own corr for the files).
        var lakeProfile = lake[0].GetProperty("profile");
        var mariaProfile = maria[0].GetProperty("profile");
        Assert.Equal(0.816, lakeProfile.GetProperty("pearson_r").GetDouble(), 3);
        Assert.Equal(0.816, mariaProfile.GetProperty("pearson_r").GetDouble(), 3);
        Assert.Equal(ParquetFiles.Scalar($"SELECT corr(y, x) FROM read_parquet('{_folder}/anscombe/*.parquet')"), lakeProfile.GetProperty("pearson_r").GetDouble(), 12);
        Assert.Equal(Correlation.Pearson(X, SetII), mariaProfile.GetProperty("pearson_r").GetDouble(), 12);
        Assert.Equal(0.500, lakeProfile.GetProperty("slope").GetDouble(), 3);
        Assert.Equal(0.500, mariaProfile.GetProperty("slope").GetDouble(), 3);
        Assert.Equal(11, lakeProfile.GetProperty("n_used").GetInt32());
        Assert.Equal(11, mariaProfile.GetProperty("n_used").GetInt32());

        // /healthz: the store answers and the scheduler runs.
        using (var health = await client.GetAsync(new Uri("/healthz", UriKind.Relative)))
        {
            Assert.Equal(200, (int)health.StatusCode);
            using var body = JsonDocument.Parse(await health.Content.ReadAsStringAsync());
            Assert.Equal("ok", body.RootElement.GetProperty("status").GetString());
            Assert.True(body.RootElement.GetProperty("scheduler").GetProperty("running").GetBoolean());
        }

        // The overview names every pair and shows r as published; each pair page its figures and the SVG plots.
        var overview = await client.GetStringAsync(new Uri("/", UriKind.Relative));
        foreach (var pair in new[] { "lake-anscombe", "maria-anscombe", "lake-missing", "maria-doomed" })
        {
            Assert.Contains(pair, overview, StringComparison.Ordinal);
        }

        Assert.Contains(">0.816<", overview, StringComparison.Ordinal);
        foreach (var (pair, table) in new[] { ("lake-anscombe", "anscombe/*.parquet"), ("maria-anscombe", "anscombe") })
        {
            var page = await client.GetStringAsync(new Uri("/pairs/" + pair, UriKind.Relative));
            Assert.Contains(pair, page, StringComparison.Ordinal);
            Assert.Contains(table, page, StringComparison.Ordinal);
            Assert.Contains(">0.816<", page, StringComparison.Ordinal);
            Assert.Contains("<svg ", page, StringComparison.Ordinal);
            Assert.Contains("Scatter plot of y against x", page, StringComparison.Ordinal);
        }

        var failedPage = await client.GetStringAsync(new Uri("/pairs/maria-doomed", UriKind.Relative));
        Assert.Contains("doesn&#39;t exist", failedPage.Replace("&#x27;", "&#39;", StringComparison.Ordinal), StringComparison.Ordinal);

        // The JSON API lists every pair with its latest run, and its index names the runs endpoint.
        using (var pairs = JsonDocument.Parse(await client.GetStringAsync(new Uri("/api/pairs", UriKind.Relative))))
        {
            var latest = pairs.RootElement.GetProperty("pairs").EnumerateArray()
                .ToDictionary(p => p.GetProperty("name").GetString()!, p => p.GetProperty("latest_run").GetProperty("status").GetString());
            Assert.Equal("succeeded", latest["lake-anscombe"]);
            Assert.Equal("succeeded", latest["maria-anscombe"]);
            Assert.Equal("failed", latest["lake-missing"]);
            Assert.Equal("failed", latest["maria-doomed"]);
        }

        Assert.Contains("/api/pairs/{name}/runs", await client.GetStringAsync(new Uri("/api", UriKind.Relative)), StringComparison.Ordinal);

        // Alerts: each failing pair, after three failed checks in a row (check_failing_after), is mailed once as a
        // critical "cannot be checked" with its error; the healthy pairs are never mailed.
        var mails = await MailsAsync(smtp, worker, all => Section(all, "lake-missing") && Section(all, "maria-doomed"));
        Assert.Equal(0, await worker.StopAsync());
        foreach (var (pair, error) in new[] { ("lake-missing", "No files found that match the pattern"), ("maria-doomed", "doomed' doesn't exist") })
        {
            var mail = Assert.Single(mails, m => m.TextBody!.Contains($"== {pair} ==", StringComparison.Ordinal));
            Assert.Contains("cannot be checked", mail.Subject, StringComparison.Ordinal);
            Assert.Contains("(critical)", mail.Subject, StringComparison.Ordinal);
            Assert.Contains(error, mail.TextBody!, StringComparison.Ordinal);
            Assert.Contains("statistical signals, not proof", mail.TextBody!, StringComparison.Ordinal);
        }

        Assert.False(Section(mails, "lake-anscombe") || Section(mails, "maria-anscombe"), "a healthy pair was mailed");

        static bool Section(IReadOnlyList<MimeMessage> all, string pair) => all.Any(m => m.TextBody!.Contains($"== {pair} ==", StringComparison.Ordinal));
    }

    /// <summary>The messages received so far, once <paramref name="done"/> holds for them (bounded by the worker's deadline).</summary>
    private static async Task<IReadOnlyList<MimeMessage>> MailsAsync(SimpleSmtpServer smtp, WorkerProcess worker, Func<IReadOnlyList<MimeMessage>, bool> done)
    {
        using var deadline = new CancellationTokenSource(WorkerProcess.Deadline);
        while (true)
        {
            var received = LoopbackSmtp.Received(smtp);
            if (done(received))
            {
                return received;
            }

            Assert.False(deadline.IsCancellationRequested, $"gave up waiting for mail; {received.Count} received; worker output:\n{worker.Output}");
            await Task.Delay(100);
        }
    }

    private static string Values(double[] y, int from, int to) =>
        string.Join(", ", Enumerable.Range(from, to - from).Select(i => string.Create(CultureInfo.InvariantCulture, $"({X[i]:R}, {y[i]:R})")));

    private static bool Succeeded(JsonElement run) => run.GetProperty("status").GetString() == "succeeded";

    private static bool Failed(JsonElement run) => run.GetProperty("status").GetString() == "failed";

    private static DateTimeOffset StartedAt(JsonElement run) => run.GetProperty("started_at").GetDateTimeOffset();

    private string WriteConfig(int port, int smtpPort)
    {
        var path = Path.Combine(_folder, "driftwatch.yaml");
        File.WriteAllText(path, $"""
            sources:
              - name: lake
                kind: duckdb
              - name: shop
                kind: mysql
            {MySqlSourceYaml.Lines(_mysql, _folder, "mysql.secret")}
            store:
              kind: sqlite
              connection: store.db
            defaults:
              schedule: "* * * * * ?"
              sample:
                method: all
            pairs:
              - name: lake-anscombe
                source: lake
                table: 'anscombe/*.parquet'
                x: x
                y: y
              - name: lake-missing
                source: lake
                table: 'nowhere/*.parquet'
                x: x
                y: y
              - name: maria-anscombe
                source: shop
                table: anscombe
                x: x
                y: y
              - name: maria-doomed
                source: shop
                table: doomed
                x: x
                y: y
            dashboard:
              enabled: true
              bind: 127.0.0.1
              port: {port}
            worker:
              stop_grace: 5s
            alerting:
              smtp:
                host: 127.0.0.1
                port: {smtpPort}
                security: none
                from: driftwatch@example.test
              mailing_lists:
                - name: oncall
                  recipients: [oncall@example.test]
                  from_severity: warning
            """);
        return path;
    }

    /// <summary>Reads the pair's runs (newest first) from the API until <paramref name="done"/> holds; the worker may still be starting.</summary>
    private static async Task<List<JsonElement>> UntilAsync(HttpClient client, WorkerProcess worker, string pair, Func<List<JsonElement>, bool> done)
    {
        using var deadline = new CancellationTokenSource(WorkerProcess.Deadline);
        var uri = new Uri($"/api/pairs/{pair}/runs?page_size=100", UriKind.Relative);
        while (true)
        {
            try
            {
                using var document = JsonDocument.Parse(await client.GetStringAsync(uri, deadline.Token));
                var runs = document.RootElement.GetProperty("runs").EnumerateArray().Select(r => r.Clone()).ToList();
                if (done(runs))
                {
                    return runs;
                }
            }
            catch (HttpRequestException) when (!deadline.IsCancellationRequested)
            {
                // Not listening yet, or the pair has no history yet (404).
            }

            Assert.False(deadline.IsCancellationRequested, $"gave up waiting on the runs of {pair}; worker output:\n{worker.Output}");
            await Task.Delay(100);
        }
    }
}
