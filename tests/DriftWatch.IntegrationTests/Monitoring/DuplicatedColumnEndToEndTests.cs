using DriftWatch.Cli;
using DriftWatch.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Hosting;
using DriftWatch.IntegrationTests.Alerting;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Monitoring;
using Microsoft.Extensions.DependencyInjection;
using MimeKit;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>
/// The product's promise end to end, on real components: a watched PostgreSQL table, the SQLite store, a real
/// SMTP server. A column that becomes a copy of another turns into one critical email with the plot inline.
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class DuplicatedColumnEndToEndTests(PostgresServer server) : IDisposable
{
    private readonly TemporarySqliteStore _store = new();

    [Fact]
    public async Task DuplicatedColumn_InWatchedTable_SendsOneCriticalEmailWithInlinePlot()
    {
        await using var db = await PostgresDatabase.CreateAsync(server);
        // Two independent weighings of each parcel: scale noise of ±1 kg around the declared weight.
        await db.ExecuteAsync("""
            CREATE TABLE parcels (declared_kg double precision, weighed_kg double precision);
            SELECT setseed(0.42);
            INSERT INTO parcels SELECT d, d + (random() - 0.5) * 2 FROM (SELECT 100 + random() * 900 AS d FROM generate_series(1, 2000)) s;
            """);
        using var smtp = LoopbackSmtp.Start();
        var config = LoadConfig(db.ConnectionString, LoopbackSmtp.Port(smtp));

        await using var services = await OneShotServices.StartAsync(config, verbose: false, CancellationToken.None);
        var pass = services.GetRequiredService<CheckPass>();
        var pairs = config.Pairs;

        // Two healthy runs form the baseline (first_runs: 2): no email.
        for (var i = 0; i < 2; i++)
        {
            var healthy = await pass.RunAsync(pairs, null, CancellationToken.None);
            Assert.DoesNotContain(healthy.Checks[0].Findings, f => f.Severity >= Severity.Warning);
        }

        Assert.Empty(smtp.ReceivedEmail);

        // The fault: a join bug copies the declared weight into the weighed one.
        await db.ExecuteAsync("UPDATE parcels SET weighed_kg = declared_kg");
        var faulty = await pass.RunAsync(pairs, null, CancellationToken.None);

        // y = x exactly gives r = 1 by definition (common practice): the engine must call it a copy.
        var finding = Assert.Single(faulty.Checks[0].Findings, f => f.Kind == FindingKind.BecamePerfect);
        Assert.Equal(Severity.Critical, finding.Severity);
        Assert.True(faulty.Checks[0].Profile!.ExactIdentity);

        var message = Assert.Single(await LoopbackSmtp.WaitForAsync(smtp, 1));
        Assert.Equal("oncall@example.test", Assert.Single(message.To.Mailboxes).Address);
        Assert.Equal("DriftWatch · parcel-weights: became perfect (critical)", message.Subject);
        var image = Assert.Single(message.BodyParts.OfType<MimePart>(), p => p.ContentType.MimeType == "image/png");
        Assert.Contains("cid:" + image.ContentId, message.HtmlBody!, StringComparison.Ordinal);
        using var png = new MemoryStream();
        await image.Content!.DecodeToAsync(png);
        Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, png.ToArray()[..8]);
        Assert.Contains("weighed_kg", message.TextBody!, StringComparison.Ordinal);

        // Still confirmed at the next check: no second email before the reminder interval.
        var again = await pass.RunAsync(pairs, null, CancellationToken.None);
        Assert.Contains(again.Checks[0].Findings, f => f.Kind == FindingKind.BecamePerfect);
        await Task.Delay(300);
        Assert.Single(smtp.ReceivedEmail);
    }

    private Core.Configuration.DriftWatchConfig LoadConfig(string sourceConnection, int smtpPort)
    {
        var yaml = $$"""
            sources:
              - name: warehouse
                kind: postgres
                connection: ${SOURCE_PG}
            store:
              kind: sqlite
              connection: {{_store.DatabasePath}}
            pairs:
              - name: parcel-weights
                source: warehouse
                table: parcels
                x: declared_kg
                y: weighed_kg
                sample:
                  method: all
                baseline:
                  first_runs: 2
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
            """;
        var result = ConfigLoader.Parse(yaml, "e2e.yaml", name => name == "SOURCE_PG" ? sourceConnection : null, _store.Folder);
        Assert.True(result.Ok, string.Join("\n", result.Errors));
        return result.Config!;
    }

    public void Dispose() => _store.Dispose();
}
