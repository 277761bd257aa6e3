using System.Text;
using System.Text.Json;
using DriftWatch.Alerting.Digest;
using DriftWatch.Alerting.Routing;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Tests.Plots;
using static DriftWatch.Tests.Alerting.AlertSamples;

namespace DriftWatch.Tests.Alerting;

/// <summary>
/// The body a webhook mailing list posts. Figures are Anscombe's sets I and III (AlertSamples: published r = 0.816,
/// slope 0.500); the checks are that the document says what the mail says, as data, and carries no sampled value.
/// </summary>
public sealed class DigestWebhookBodyTests
{
    private static readonly Uri PublicUrl = new("https://dw.example.org/");

    private static MailingListConfig Hook(WebhookFormat format = WebhookFormat.Full) => new()
    {
        Name = "ops-hook",
        Channel = ChannelKind.Webhook,
        Url = new Uri("https://hooks.example.org/in"),
        Secret = "0123456789abcdef",
        Format = format,
    };

    private static AddressedDigest Digest(MailingListConfig list) => new(list,
    [
        Item(Alert("weighed_vs_declared", FindingKind.SlopeShift, Severity.Critical, id: 42, message: "The slope moved."), NotificationKind.Confirmed),
        Item(Alert("weighed_vs_declared", FindingKind.OutlierSurge, Severity.Warning, id: 43), NotificationKind.Reminder),
        Item(Alert("box_vs_items", FindingKind.CorrelationShift, Severity.Warning, AlertStatus.Cleared, id: 7), NotificationKind.Cleared),
    ]);

    private static JsonElement Parse(OutboxMessage message) => JsonDocument.Parse(message.Mime).RootElement;

    [Fact]
    public void Compose_Full_CarriesListCycleEachAlertAndItsFigures()
    {
        var message = DigestWebhookBody.Compose(Digest(Hook()), PublicUrl, At);
        var json = Parse(message);

        Assert.Equal("driftwatch.digest", json.GetProperty("type").GetString());
        Assert.Equal(1, json.GetProperty("version").GetInt32());
        Assert.Equal(message.MessageId, json.GetProperty("id").GetString());
        Assert.Equal("ops-hook", json.GetProperty("mailing_list").GetString());
        Assert.Equal(At, json.GetProperty("cycle_at").GetDateTimeOffset());
        Assert.Equal((ChannelKind.Webhook, "ops-hook"), (message.Channel, message.MailingList));
        Assert.Empty(message.Recipients);

        var pairs = json.GetProperty("pairs").EnumerateArray().ToArray();
        // Worst first: the pair with the critical alert, then the all-clear.
        Assert.Equal(["weighed_vs_declared", "box_vs_items"], pairs.Select(p => p.GetProperty("pair").GetString()));
        var first = pairs[0];
        Assert.Equal(("warehouse", "shipping.parcels", "declared_kg", "weighed_kg"),
            (first.GetProperty("source").GetString(), first.GetProperty("table").GetString(), first.GetProperty("x").GetString(), first.GetProperty("y").GetString()));
        Assert.Equal("https://dw.example.org/pairs/weighed_vs_declared", first.GetProperty("dashboard_url").GetString());
        Assert.Equal("https://dw.example.org/pairs/weighed_vs_declared#triage", first.GetProperty("triage_url").GetString());

        var alerts = first.GetProperty("alerts").EnumerateArray().ToArray();
        Assert.Equal(2, alerts.Length);
        Assert.Equal((42L, "slope_shift", "critical", "confirmed", "new", "slope changed", "The slope moved."), (
            alerts[0].GetProperty("id").GetInt64(), alerts[0].GetProperty("kind").GetString(), alerts[0].GetProperty("severity").GetString(),
            alerts[0].GetProperty("state").GetString(), alerts[0].GetProperty("notice").GetString(), alerts[0].GetProperty("headline").GetString(),
            alerts[0].GetProperty("message").GetString()));
        Assert.Equal(("outlier_surge", "reminder"), (alerts[1].GetProperty("kind").GetString(), alerts[1].GetProperty("notice").GetString()));
        var cleared = pairs[1].GetProperty("alerts")[0];
        Assert.Equal(("cleared", "cleared"), (cleared.GetProperty("state").GetString(), cleared.GetProperty("notice").GetString()));

        // The table the mail shows, as values: Anscombe I (baseline) and III (current), r = 0.816 both, slope 0.500 → 0.4997.
        var figures = first.GetProperty("figures").EnumerateArray().ToDictionary(f => f.GetProperty("name").GetString()!);
        Assert.Equal(["rows_used", "pearson_r", "spearman_rho", "slope", "curvature_p", "outlier_rate", "null_rate"], figures.Keys);
        Assert.Equal((0.816, 0.816), (figures["pearson_r"].GetProperty("baseline").GetDouble(), figures["pearson_r"].GetProperty("current").GetDouble()));
        Assert.Equal((0.5, 0.4997), (figures["slope"].GetProperty("baseline").GetDouble(), figures["slope"].GetProperty("current").GetDouble()));
        Assert.Equal(1.0 / 11, figures["outlier_rate"].GetProperty("current").GetDouble(), 12);
        Assert.Equal(1.0 / 12, figures["null_rate"].GetProperty("current").GetDouble(), 12);
        // The same words as the mail's table (DigestFigures).
        var mailRows = DigestFigures.Rows(Context(Pair("weighed_vs_declared")));
        Assert.Equal(mailRows.Select(r => (r.Name, r.Baseline, r.Current)), figures.Values.Select(f => (f.GetProperty("label").GetString()!, f.GetProperty("baseline_text").GetString()!, f.GetProperty("current_text").GetString()!)));
    }

    [Fact]
    public void Compose_Full_CarriesTheCautionsAndNoSampledValueNorPlot()
    {
        var message = DigestWebhookBody.Compose(Digest(Hook()), PublicUrl, At);
        var json = Parse(message);
        var text = Encoding.UTF8.GetString(message.Mime);

        Assert.Equal([DigestCautions.Signals, DigestWebhookBody.NoSampledValues], json.GetProperty("cautions").EnumerateArray().Select(c => c.GetString()));
        // Anscombe's y values of sets I and III (the sampled points the context holds) are no number of the document …
        var sampled = AnscombeData.Y1.Concat(AnscombeData.Y3).ToHashSet();
        Assert.DoesNotContain(Numbers(json), sampled.Contains);
        // … and the document has only the documented fields (docs/alerting.md): no points, no image.
        Assert.Equal(
            [
                "alerts", "baseline", "baseline_text", "cautions", "cleared_at", "confirmed_at", "consecutive_runs", "current", "current_text",
                "cycle_at", "dashboard_url", "equation", "figures", "first_seen", "headline", "id", "kind", "label", "mailing_list", "message",
                "name", "notice", "pair", "pairs", "severity", "source", "state", "subject", "summary", "table", "triage_url", "type", "version", "x", "y",
            ],
            Names(json).Order(StringComparer.Ordinal));
        Assert.DoesNotContain("png", text, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("base64", text, StringComparison.OrdinalIgnoreCase);
    }

    private static IEnumerable<double> Numbers(JsonElement element) => element.ValueKind switch
    {
        JsonValueKind.Number => [element.GetDouble()],
        JsonValueKind.Array => element.EnumerateArray().SelectMany(Numbers),
        JsonValueKind.Object => element.EnumerateObject().SelectMany(p => Numbers(p.Value)),
        _ => [],
    };

    private static HashSet<string> Names(JsonElement element)
    {
        var names = new HashSet<string>(StringComparer.Ordinal);
        Walk(element);
        return names;

        void Walk(JsonElement e)
        {
            if (e.ValueKind == JsonValueKind.Object)
            {
                foreach (var property in e.EnumerateObject())
                {
                    names.Add(property.Name);
                    Walk(property.Value);
                }
            }
            else if (e.ValueKind == JsonValueKind.Array)
            {
                foreach (var item in e.EnumerateArray())
                {
                    Walk(item);
                }
            }
        }
    }

    [Fact]
    public void Compose_WithoutPublicUrl_LeavesLinksNull()
    {
        var json = Parse(DigestWebhookBody.Compose(Digest(Hook()), null, At));

        var first = json.GetProperty("pairs")[0];
        Assert.Equal(JsonValueKind.Null, first.GetProperty("dashboard_url").ValueKind);
        Assert.Equal(JsonValueKind.Null, first.GetProperty("triage_url").ValueKind);
    }

    [Fact]
    public void Compose_SameDigest_SameIdAsTheMailWouldHaveAndSameBytes()
    {
        var digest = Digest(Hook());
        var once = DigestWebhookBody.Compose(digest, PublicUrl, At);
        var again = DigestWebhookBody.Compose(digest, PublicUrl, At);

        Assert.Equal(once.Mime, again.Mime);
        Assert.Equal(MessageIds.ForDigest("ops-hook", At, digest.Items), once.MessageId);
    }

    [Fact]
    public void Compose_Text_HasAPlainTextFieldWithEachAlertItsFiguresLinkAndCautions()
    {
        var message = DigestWebhookBody.Compose(Digest(Hook(WebhookFormat.Text)), PublicUrl, At);
        var json = Parse(message);
        var text = json.GetProperty("text").GetString()!;
        var lines = text.Split('\n');

        Assert.Equal(DigestSubject.For(Digest(Hook()).Items), lines[0]);
        Assert.Equal("2 alerts need a look, 1 alert cleared.", lines[1]);
        // r and slope as the mail's table writes them.
        var rows = DigestFigures.Rows(Context(Pair("weighed_vs_declared")));
        var (r, slope) = (rows.Single(f => f.Key == "pearson_r"), rows.Single(f => f.Key == "slope"));
        Assert.Equal(
            $"• [CRITICAL] weighed_vs_declared: slope changed (new) · r {r.Baseline} → {r.Current} · slope {slope.Baseline} → {slope.Current} · https://dw.example.org/pairs/weighed_vs_declared",
            lines[2]);
        Assert.StartsWith("• [WARNING] weighed_vs_declared: more outliers (reminder)", lines[3], StringComparison.Ordinal);
        Assert.StartsWith("• [CLEARED] box_vs_items: correlation changed · r", lines[4], StringComparison.Ordinal);
        Assert.Equal([DigestCautions.Signals, DigestWebhookBody.NoSampledValues], lines[5..]);
        Assert.Equal("driftwatch.digest.text", json.GetProperty("type").GetString());
        Assert.Equal(message.MessageId, json.GetProperty("id").GetString());
        var first = json.GetProperty("alerts")[0];
        Assert.Equal(("weighed_vs_declared", "slope_shift", "critical", 0.5, 0.4997), (
            first.GetProperty("pair").GetString(), first.GetProperty("kind").GetString(), first.GetProperty("severity").GetString(),
            first.GetProperty("slope_baseline").GetDouble(), first.GetProperty("slope_now").GetDouble()));
    }
}
