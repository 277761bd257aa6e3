using DriftWatch.Alerting.Channels.File;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using MimeKit;
using static DriftWatch.IntegrationTests.Alerting.AlertHarness;

namespace DriftWatch.IntegrationTests.Alerting;

public sealed class FileChannelTests : IDisposable
{
    private readonly TemporarySqliteStore _file = new();

    [Fact]
    public async Task Dispatch_FileMailingList_WritesTheSameMessageAsAnEmlFile()
    {
        var folder = Path.Combine(_file.Folder, "outbox-files");
        var config = new AlertingConfig { MailingLists = [new MailingListConfig { Name = "archive", Channel = ChannelKind.File, Directory = folder, Recipients = ["audit@example.org"] }] };
        var harness = new AlertHarness(await _file.OpenAsync(), config);

        var cycle = await harness.CycleAsync((Pair("weighed_vs_declared"), [Critical(FindingKind.BecamePerfect, "weighed_kg equals declared_kg")]));
        await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        var queued = Assert.Single(cycle.Queued);
        var path = Assert.Single(Directory.GetFiles(folder));
        Assert.Equal(FileAlertChannel.PathFor(folder, queued.MessageId), path);
        Assert.EndsWith(".eml", path, StringComparison.Ordinal);
        Assert.Equal(queued.Mime, await File.ReadAllBytesAsync(path));
        using var message = await MimeMessage.LoadAsync(path);
        Assert.Equal("DriftWatch · weighed_vs_declared: became perfect (critical)", message.Subject);
        Assert.Equal(queued.MessageId, message.MessageId);
        Assert.Equal("audit@example.org", message.To.Mailboxes.Single().Address);
        Assert.Single(message.BodyParts.OfType<TextPart>(), p => p.IsPlain);
        var html = Assert.Single(message.BodyParts.OfType<TextPart>(), p => p.IsHtml).Text;
        var image = Assert.Single(message.BodyParts.OfType<MimePart>(), p => p.ContentType.IsMimeType("image", "png"));
        Assert.Contains($"cid:{image.ContentId}", html, StringComparison.Ordinal);
        Assert.Empty(await harness.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
    }

    [Fact]
    public async Task Send_Retried_RewritesTheSameFileOnce()
    {
        var folder = Path.Combine(_file.Folder, "retry");
        var config = new AlertingConfig { MailingLists = [new MailingListConfig { Name = "archive", Channel = ChannelKind.File, Directory = folder }] };
        var harness = new AlertHarness(await _file.OpenAsync(), config);
        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.SignFlip, "flipped")]));
        var entry = Assert.Single(await harness.Outbox.ClaimDueAsync(harness.Time.GetUtcNow(), TimeSpan.FromMinutes(5), harness.Options.ClaimOwner, 10, CancellationToken.None));
        var channel = new FileAlertChannel();

        await channel.SendAsync(entry, config.MailingLists[0], CancellationToken.None);
        await channel.SendAsync(entry, config.MailingLists[0], CancellationToken.None);

        var file = Assert.Single(Directory.GetFiles(folder));
        Assert.Equal(entry.Mime, await File.ReadAllBytesAsync(file));
    }

    public void Dispose() => _file.Dispose();
}
