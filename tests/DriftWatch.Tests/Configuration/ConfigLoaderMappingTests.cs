using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Statistics;
using Microsoft.Data.Sqlite;
using Npgsql;

namespace DriftWatch.Tests.Configuration;

public sealed class ConfigLoaderMappingTests : IDisposable
{
    private const string PgPassword = "pg-Secret-Value-9";
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private DriftWatchConfig LoadFull()
    {
        _dir.Write(FullConfig.PasswordFileName, PgPassword + "\n");
        _dir.Write(FullConfig.CaFileName, SelfSignedAuthorityPem());
        var result = ConfigText.Parse(FullConfig.Yaml, FullConfig.Env, _dir.Path);
        Assert.Empty(ConfigText.Lines(result));
        Assert.True(result.Ok);
        return result.Config!;
    }

    [Fact]
    public void Parse_FullConfig_MapsSources()
    {
        var config = LoadFull();
        Assert.Equal(2, config.Sources.Count);
        var shop = config.FindSource("shop")!;
        Assert.Equal(SourceKind.Postgres, shop.Kind);
        Assert.Equal(4, shop.MaxConcurrentQueries);
        Assert.Equal(TimeSpan.FromSeconds(90), shop.StatementTimeout);

        // Npgsql's own builder reads the result back: env expanded, the default used, the file's password set.
        var pg = new NpgsqlConnectionStringBuilder(shop.ConnectionString);
        Assert.Equal("db.internal", pg.Host);
        Assert.Equal(5433, pg.Port);
        Assert.Equal("grocer", pg.Database);
        Assert.Equal("reader", pg.Username);
        Assert.Equal(PgPassword, pg.Password);

        var warehouse = config.FindSource("warehouse")!;
        Assert.Equal(SourceKind.Sqlite, warehouse.Kind);
        Assert.Equal(SourceConfig.DefaultMaxConcurrentQueries, warehouse.MaxConcurrentQueries);
        Assert.Equal(SourceConfig.DefaultStatementTimeout, warehouse.StatementTimeout);
        var sqlite = new SqliteConnectionStringBuilder(warehouse.ConnectionString);
        Assert.Equal(Path.Combine(_dir.Path, "data", "warehouse.db"), sqlite.DataSource);
    }

    [Fact]
    public void Parse_FullConfig_MapsStoreDashboardAndLogging()
    {
        var config = LoadFull();
        Assert.Equal(StoreKind.Sqlite, config.Store.Kind);
        Assert.Equal(Path.Combine(_dir.Path, "history", "dw.db"), new SqliteConnectionStringBuilder(config.Store.ConnectionString).DataSource);
        Assert.Equal(TimeSpan.FromDays(90), config.Store.Retention);
        Assert.Equal(500, config.Store.PointsPerRun);
        Assert.Equal(TimeSpan.FromDays(40), config.Store.PointsRetention);

        Assert.True(config.Dashboard.Enabled);
        Assert.Equal("0.0.0.0", config.Dashboard.Bind);
        Assert.Equal(9000, config.Dashboard.Port);
        Assert.Equal("dashboard-token-0123456789", config.Dashboard.AccessToken);

        Assert.Equal(LogFormat.Json, config.Logging.Format);
        Assert.Equal(Path.Combine(_dir.Path, "logs", "dw.log"), config.Logging.File);
        Assert.Equal("Debug", config.Logging.MinimumLevel);
        Assert.Equal(TimeSpan.FromSeconds(45), config.Worker.StopGrace);
        Assert.Equal("monitor-1", config.Worker.Id);
        Assert.Equal(TimeSpan.FromSeconds(10), config.Worker.AlertEvery);
    }

    [Fact]
    public void Parse_FullConfig_MapsAlerting()
    {
        var alerting = LoadFull().Alerting;
        Assert.Equal(3, alerting.WarningConfirmRuns);
        Assert.Equal(2, alerting.CriticalConfirmRuns);
        Assert.Equal(TimeSpan.FromHours(12), alerting.RemindEvery);
        Assert.Null(alerting.FdrQ);
        Assert.Equal(5, alerting.CheckFailingAfter);
        Assert.Equal(new Uri("https://dw.grocer.example/"), alerting.PublicUrl);

        var smtp = alerting.Smtp!;
        Assert.Equal("mail.grocer.example", smtp.Host);
        Assert.Equal(465, smtp.Port);
        Assert.Equal(SmtpSecurity.Tls, smtp.Security);
        Assert.Equal(Path.Combine(_dir.Path, FullConfig.CaFileName), smtp.CaFile);
        Assert.Equal("driftwatch", smtp.User);
        Assert.Equal("smtp-Secret-Value-7", smtp.Password);
        Assert.Equal("DriftWatch <dw@grocer.example>", smtp.From);

        Assert.Collection(
            alerting.MailingLists,
            team =>
            {
                Assert.Equal("team", team.Name);
                Assert.Equal(ChannelKind.Smtp, team.Channel);
                Assert.Equal(["data@grocer.example", "Ops <ops@grocer.example>"], team.Recipients);
                Assert.Equal(Severity.Info, team.FromSeverity);
                Assert.Equal(["finance"], team.Tags);
                Assert.False(team.IncludePlot);
                Assert.Null(team.Directory);
            },
            archive =>
            {
                Assert.Equal("archive", archive.Name);
                Assert.Equal(ChannelKind.File, archive.Channel);
                Assert.Empty(archive.Recipients);
                Assert.Equal(Severity.Critical, archive.FromSeverity);
                Assert.True(archive.IncludePlot);
                Assert.Equal(Path.Combine(_dir.Path, "alerts"), archive.Directory);
            },
            chat =>
            {
                Assert.Equal("chat", chat.Name);
                Assert.Equal(ChannelKind.Webhook, chat.Channel);
                Assert.Equal(new Uri("https://hooks.grocer.example/in/hook-token-T0K"), chat.Url);
                Assert.Equal("hook-Secret-Value-0123", chat.Secret);
                Assert.Equal(WebhookFormat.Text, chat.Format);
                Assert.Equal(TimeSpan.FromSeconds(20), chat.Timeout);
                Assert.Empty(chat.Recipients);
                Assert.Null(chat.Directory);
            });
    }

    [Fact]
    public void Parse_FullConfig_PairOverridesMergeOverDefaults()
    {
        var pair = LoadFull().FindPair("basket-items-vs-value")!;
        Assert.Equal("shop", pair.Source);
        Assert.Equal("shop.orders", pair.Table);
        Assert.Equal("status = 'completed'", pair.Where);
        Assert.Null(pair.Query);
        Assert.Equal("basket_items", pair.X);
        Assert.Equal("basket_value", pair.Y);
        Assert.Equal(new WindowSpec("placed_at", TimeSpan.FromHours(36), WindowAnchor.Latest), pair.Window);

        // sample: rows and method from the pair, the rest from defaults.sample.
        Assert.Equal(new SampleSpec { Rows = 300, Method = SampleMethod.Tablesample, AllRowsBelow = 1000, Bernoulli = true, Seed = 7 }, pair.Sample);

        // A five-field crontab line, in Quartz form: seconds 0 prepended, '?' for day-of-week.
        Assert.Equal("0 15 * * * ?", pair.Schedule);
        Assert.Equal(new PairDeclaration(DeclaredDirection.Positive, false), pair.Declared);

        // thresholds: the pair's key over the defaults' keys over the built-in values.
        Assert.Equal(Thresholds.Default with { Alpha = 0.05, OutlierT = 4, MinCorrelationChange = 0.25 }, pair.Thresholds);

        Assert.Equal(BaselinePolicyKind.Window, pair.Baseline.Kind);
        Assert.Equal(new DateTimeOffset(2026, 1, 1, 0, 0, 0, TimeSpan.Zero), pair.Baseline.From);
        Assert.Equal(new DateTimeOffset(2026, 2, 1, 0, 0, 0, TimeSpan.Zero).AddTicks(-1), pair.Baseline.To);
        Assert.Equal(["team", "archive"], pair.Notify);
        Assert.Equal(["orders", "finance"], pair.Tags);
        Assert.Equal($"{ConfigText.File}:32", pair.Location);
    }

    [Fact]
    public void Parse_FullConfig_PairWithoutOverridesTakesDefaults()
    {
        var config = LoadFull();
        var query = config.FindPair("net-vs-gross")!;
        Assert.Null(query.Table);
        Assert.Equal("SELECT net_total, gross_total FROM shop.invoices", query.Query);
        Assert.Equal(new PairDeclaration(DeclaredDirection.Negative, true), query.Declared);
        Assert.Equal(new BaselinePolicy { Kind = BaselinePolicyKind.Rolling, RollingPeriod = TimeSpan.FromDays(30) }, query.Baseline);
        Assert.Equal(["team"], query.Notify);

        var plain = config.FindPair("pick-lines-vs-seconds")!;
        Assert.Equal("0 */10 * * * ?", plain.Schedule);
        Assert.Equal(new SampleSpec { Rows = 2000, Method = SampleMethod.Random, AllRowsBelow = 1000, Bernoulli = true, Seed = 7 }, plain.Sample);
        Assert.Equal(Thresholds.Default with { Alpha = 0.05, OutlierT = 4 }, plain.Thresholds);
        Assert.Equal(new BaselinePolicy { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 8 }, plain.Baseline);
        Assert.Null(plain.Window);
        Assert.Equal(PairDeclaration.None, plain.Declared);
        Assert.Empty(plain.Notify);
        Assert.Empty(plain.Tags);
    }

    [Fact]
    public void Parse_MinimalConfig_AppliesEveryDefault()
    {
        var result = ConfigText.Parse(ConfigText.SqliteSource + """

            pairs:
              - name: a
                source: shop
                table: t
                x: u
                y: v
            """);
        Assert.Empty(ConfigText.Lines(result));
        var config = result.Config!;
        var pair = Assert.Single(config.Pairs);
        Assert.Equal(PairConfig.DefaultSchedule, pair.Schedule);
        Assert.Equal(new SampleSpec(), pair.Sample);
        Assert.Equal(Thresholds.Default, pair.Thresholds);
        Assert.Equal(new BaselinePolicy(), pair.Baseline);

        Assert.Equal(StoreKind.Sqlite, config.Store.Kind);
        Assert.Equal(Path.Combine(ConfigText.BaseDirectory, "data", "driftwatch.db"), new SqliteConnectionStringBuilder(config.Store.ConnectionString).DataSource);
        Assert.Equal(StoreConfig.DefaultRetention, config.Store.Retention);
        Assert.Equal(StoreConfig.DefaultPointsPerRun, config.Store.PointsPerRun);
        Assert.Equal(StoreConfig.DefaultPointsRetention, config.Store.PointsRetention);

        Assert.Empty(config.Alerting.MailingLists);
        Assert.Null(config.Alerting.Smtp);
        Assert.Equal(AlertingConfig.DefaultWarningConfirmRuns, config.Alerting.WarningConfirmRuns);
        Assert.Equal(AlertingConfig.DefaultCriticalConfirmRuns, config.Alerting.CriticalConfirmRuns);
        Assert.Equal(AlertingConfig.DefaultRemindEvery, config.Alerting.RemindEvery);
        Assert.Equal(AlertingConfig.DefaultFdrQ, config.Alerting.FdrQ);
        Assert.Equal(AlertingConfig.DefaultCheckFailingAfter, config.Alerting.CheckFailingAfter);
        Assert.Null(config.Alerting.PublicUrl);
        Assert.Equal(new DashboardConfig(), config.Dashboard);
        Assert.Equal(new LoggingConfig(), config.Logging);
    }

    [Fact]
    public void Load_File_SetsFilePathAndResolvesAgainstItsDirectory()
    {
        var file = _dir.Write("dw.yaml", ConfigText.SqliteSource);
        var result = ConfigLoader.Load(file, _ => null);
        Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
        Assert.Equal(file, result.Config!.FilePath);
        Assert.Equal(Path.Combine(_dir.Path, "shop.db"), new SqliteConnectionStringBuilder(result.Config.Sources[0].ConnectionString).DataSource);
    }

    /// <summary>A certificate authority made here (.NET's CertificateRequest), as the PEM text ca_file takes.</summary>
    private static string SelfSignedAuthorityPem()
    {
        using var key = System.Security.Cryptography.ECDsa.Create();
        var request = new System.Security.Cryptography.X509Certificates.CertificateRequest(
            "CN=Grocer test authority", key, System.Security.Cryptography.HashAlgorithmName.SHA256);
        request.CertificateExtensions.Add(new System.Security.Cryptography.X509Certificates.X509BasicConstraintsExtension(true, false, 0, true));
        using var authority = request.CreateSelfSigned(DateTimeOffset.UtcNow.AddMinutes(-5), DateTimeOffset.UtcNow.AddDays(1));
        return authority.ExportCertificatePem();
    }
}
