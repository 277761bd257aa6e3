using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard.Pages;

namespace DriftWatch.Tests.Dashboard.Pages;

/// <summary>The one word the alerts page and /api/alerts give a delivery (docs/alerting.md, "Outbox and delivery").</summary>
public sealed class DeliveryStateTests
{
    private static readonly DateTimeOffset T0 = new(2026, 3, 2, 8, 0, 0, TimeSpan.Zero);

    private static OutboxEntry Entry(int attempts, DateTimeOffset? sent = null, DateTimeOffset? failed = null) =>
        new(1, "dw-1@driftwatch.local", "ops-hook", ChannelKind.Webhook, T0, T0, attempts, attempts > 0 ? "HTTP 400 Bad Request" : null, sent, "s", [], null, failed);

    [Fact]
    public void DeliveryState_EachStage_HasItsWord()
    {
        Assert.Equal("queued", AlertsPage.DeliveryState(Entry(0)));
        Assert.Equal("retrying", AlertsPage.DeliveryState(Entry(2)));
        Assert.Equal("sent", AlertsPage.DeliveryState(Entry(3, sent: T0)));
        Assert.Equal("failed", AlertsPage.DeliveryState(Entry(1, failed: T0)));
    }

    [Fact]
    public void ToJson_FailedForGood_HasNoNextAttempt()
    {
        var json = DriftWatch.Dashboard.Api.ApiMapping.ToJson(Entry(1, failed: T0));

        Assert.Equal(("failed", (DateTimeOffset?)null, "HTTP 400 Bad Request"), (json.State, json.NextAttemptAt, json.LastError));
    }
}
