using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using MimeKit;
using static DriftWatch.IntegrationTests.Alerting.AlertHarness;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>
/// The first mail of an alert names the id the store gave it in the same cycle — the id 'driftwatch alerts ack'
/// and the dashboard's actions take — not only later reminders. Real SQLite store, real composition.
/// </summary>
public sealed class NewAlertIdTests : IDisposable
{
    private readonly TemporarySqliteStore _file = new();

    [Fact]
    public async Task FirstMailOfANewAlert_NamesTheIdItWasStoredUnder()
    {
        var folder = Path.Combine(_file.Folder, "mails");
        var config = new AlertingConfig { MailingLists = [new MailingListConfig { Name = "archive", Channel = ChannelKind.File, Directory = folder }] };
        var harness = new AlertHarness(await _file.OpenAsync(), config);
        // An alert already stored, so the new one's id is not simply the first.
        await harness.CycleAsync((Pair("fuel_vs_distance", "distance_km", "fuel_l"), [Critical(FindingKind.SignFlip, "fuel falls with distance")]));

        var cycle = await harness.CycleAsync((Pair("weighed_vs_declared"), [Critical(FindingKind.BecamePerfect, "weighed_kg equals declared_kg")]));

        var stored = Assert.Single(cycle.Saved, a => a.Pair == "weighed_vs_declared");
        Assert.True(stored.Id > 1, $"id {stored.Id}");
        using var message = MimeMessage.Load(new MemoryStream(Assert.Single(cycle.Queued).Mime!));
        var text = Assert.Single(message.BodyParts.OfType<TextPart>(), p => p.IsPlain).Text;
        var html = Assert.Single(message.BodyParts.OfType<TextPart>(), p => p.IsHtml).Text;
        Assert.Contains($"(alert #{stored.Id})", text, StringComparison.Ordinal);
        Assert.Contains($"(alert #{stored.Id})", html, StringComparison.Ordinal);
        Assert.Equal(AlertStatus.Confirmed, (await harness.Store.GetAlertAsync(stored.Id, CancellationToken.None))!.Status);
    }

    public void Dispose() => _file.Dispose();
}
