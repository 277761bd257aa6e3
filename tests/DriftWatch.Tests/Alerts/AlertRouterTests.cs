using DriftWatch.Alerts;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using static DriftWatch.Tests.Alerts.AlertSamples;

namespace DriftWatch.Tests.Alerts;

// Routing rules are DriftWatch's own (see AlertRouter); these pin them.
public sealed class AlertRouterTests
{
    [Fact]
    public void Route_MinSeverity_KeepsWarningsFromACriticalOnlyRoute()
    {
        var warning = Item(Alert("a", FindingKind.SlopeShift, Severity.Warning), NotificationKind.Fired);
        var critical = Item(Alert("b", FindingKind.SignFlip, Severity.Critical), NotificationKind.Fired);

        var routed = AlertRouter.Route([warning, critical], [Route("pager", min: Severity.Critical), Route("team")]);

        Assert.Equal(["b"], routed.Single(r => r.Route.Name == "pager").Items.Select(i => i.Alert.Pair));
        Assert.Equal(["a", "b"], routed.Single(r => r.Route.Name == "team").Items.Select(i => i.Alert.Pair));
    }

    [Fact]
    public void Route_TagFilter_TakesOnlyPairsSharingATag()
    {
        var finance = Item(Alert("revenue", FindingKind.SignFlip, Severity.Critical), NotificationKind.Fired, Context(Pair("revenue", tags: ["finance"])));
        var ops = Item(Alert("fuel", FindingKind.SignFlip, Severity.Critical), NotificationKind.Fired, Context(Pair("fuel", tags: ["ops"])));

        var routed = AlertRouter.Route([finance, ops], [Route("finance-team", tags: ["finance", "billing"])]);

        Assert.Equal(["revenue"], Assert.Single(routed).Items.Select(i => i.Alert.Pair));
    }

    [Fact]
    public void Route_PairWithNotifyList_GoesOnlyToTheNamedRoutes_EvenPastTheirTagFilter()
    {
        var named = Item(Alert("fuel", FindingKind.SignFlip, Severity.Critical), NotificationKind.Fired, Context(Pair("fuel", tags: ["ops"], notify: ["finance-team"])));

        var routed = AlertRouter.Route([named], [Route("finance-team", tags: ["finance"]), Route("everyone")]);

        Assert.Equal("finance-team", Assert.Single(routed).Route.Name);
    }

    [Fact]
    public void Route_NothingMatches_ProducesNoDigest()
    {
        var info = Item(Alert("a", FindingKind.Curvature, Severity.Info), NotificationKind.Fired);

        Assert.Empty(AlertRouter.Route([info], [Route()]));
    }
}
