using DriftWatch.Alerting.Routing;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using static DriftWatch.Tests.Alerting.AlertSamples;

namespace DriftWatch.Tests.Alerting;

// Addressing rules are DriftWatch's own (see AlertAddressing); these pin them.
public sealed class AlertAddressingTests
{
    [Fact]
    public void Address_FromSeverity_KeepsWarningsFromACriticalOnlyList()
    {
        var warning = Item(Alert("a", FindingKind.SlopeShift, Severity.Warning), NotificationKind.Confirmed);
        var critical = Item(Alert("b", FindingKind.SignFlip, Severity.Critical), NotificationKind.Confirmed);

        var addressed = AlertAddressing.Address([warning, critical], [MailingList("pager", min: Severity.Critical), MailingList("team")]);

        Assert.Equal(["b"], addressed.Single(r => r.List.Name == "pager").Items.Select(i => i.Alert.Pair));
        Assert.Equal(["a", "b"], addressed.Single(r => r.List.Name == "team").Items.Select(i => i.Alert.Pair));
    }

    [Fact]
    public void Address_TagFilter_TakesOnlyPairsSharingATag()
    {
        var finance = Item(Alert("revenue", FindingKind.SignFlip, Severity.Critical), NotificationKind.Confirmed, Context(Pair("revenue", tags: ["finance"])));
        var ops = Item(Alert("fuel", FindingKind.SignFlip, Severity.Critical), NotificationKind.Confirmed, Context(Pair("fuel", tags: ["ops"])));

        var addressed = AlertAddressing.Address([finance, ops], [MailingList("finance-team", tags: ["finance", "billing"])]);

        Assert.Equal(["revenue"], Assert.Single(addressed).Items.Select(i => i.Alert.Pair));
    }

    [Fact]
    public void Address_PairWithNotifyList_GoesOnlyToTheNamedLists_EvenPastTheirTagFilter()
    {
        var named = Item(Alert("fuel", FindingKind.SignFlip, Severity.Critical), NotificationKind.Confirmed, Context(Pair("fuel", tags: ["ops"], notify: ["finance-team"])));

        var addressed = AlertAddressing.Address([named], [MailingList("finance-team", tags: ["finance"]), MailingList("everyone")]);

        Assert.Equal("finance-team", Assert.Single(addressed).List.Name);
    }

    [Fact]
    public void Address_NothingMatches_ProducesNoDigest()
    {
        var info = Item(Alert("a", FindingKind.Curvature, Severity.Info), NotificationKind.Confirmed);

        Assert.Empty(AlertAddressing.Address([info], [MailingList()]));
    }
}
