using System.Runtime.CompilerServices;
using System.Text.RegularExpressions;
using DriftWatch.Alerting.Digest;
using DriftWatch.Alerting.Routing;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Tests.Plots;
using MimeKit;
using static DriftWatch.Tests.Alerting.AlertSamples;

namespace DriftWatch.Tests.Alerting;

/// <summary>
/// Pins the alert email (an outward contract) against the approved HTML and plain text in Alerting/Approved/.
/// Each run also writes the received message, and a browsable copy whose cid: images point at PNG files,
/// to bin/.../received/ for review. After an intended change, run with DRIFTWATCH_APPROVE=1 to re-approve,
/// and review the diff of the approved files.
/// </summary>
public sealed partial class AlertEmailApprovalTests
{
    [Fact]
    public void Compose_ReferenceDigest_MatchesTheApprovedHtmlAndText()
    {
        using var message = DigestComposer.Compose(ReferenceDigest(), new DigestOptions("DriftWatch <driftwatch@example.org>", new Uri("https://driftwatch.example.org/")), At);
        var html = MimeParts.Html(message).Text;
        var text = MimeParts.Plain(message).Text;
        WriteReceived(message, html);

        if (Environment.GetEnvironmentVariable("DRIFTWATCH_APPROVE") == "1")
        {
            File.WriteAllText(ApprovedPath("alert-email.html"), html);
            File.WriteAllText(ApprovedPath("alert-email.txt"), text);
        }

        Assert.Equal(Normalise(File.ReadAllText(ApprovedPath("alert-email.html"))), Normalise(html));
        Assert.Equal(Normalise(File.ReadAllText(ApprovedPath("alert-email.txt"))), Normalise(text));
        Assert.Equal("DriftWatch · weighed_vs_declared: became perfect (critical) +2 more", message.Subject);
    }

    /// <summary>
    /// Three pairs, three transitions. Points and figures: Anscombe (1973) sets I and III and the published fit
    /// y = 3.00 + 0.500 x (from memory); the "became perfect" sample is set I's x on that fitted line exactly.
    /// </summary>
    internal static AddressedDigest ReferenceDigest()
    {
        var exact = new PairedSample(AnscombeData.X, [.. AnscombeData.X.Select(x => 3.0 + 0.5 * x)]);
        var perfect = new RelationshipProfile
        {
            NRows = 11, NUsed = 11, PearsonR = 1.0, SpearmanRho = 1.0, Slope = 0.5, Intercept = 3.0, QuadraticP = null, OutlierRate = 0,
            ExactAffine = true, Equation = "weighed_kg = 0.5 × declared_kg + 3",
        };
        var weights = new AlertPairContext(Pair(), perfect, exact, Baseline, AnscombeData.Set1);
        var fuel = new AlertPairContext(Pair("fuel_vs_distance", "distance_km", "fuel_l"), Current, AnscombeData.Set3, Baseline, AnscombeData.Set1);
        var refunds = new AlertPairContext(Pair("refunds_vs_orders", "orders", "refunds"), Baseline, AnscombeData.Set1, Baseline, AnscombeData.Set1);
        return new AddressedDigest(MailingList(), DigestOrder.Sort(
        [
            new DigestItem(new AlertNotification(Alert("weighed_vs_declared", FindingKind.BecamePerfect, Severity.Critical,
                message: "weighed_kg became an exact function of declared_kg (r = 1.000, was 0.816): one column may now be computed from the other"), NotificationKind.Confirmed), weights),
            new DigestItem(new AlertNotification(Alert("fuel_vs_distance", FindingKind.CurvatureAppeared, Severity.Warning,
                message: "a curve now fits fuel_l against distance_km better than a line (quadratic p < 0.001)") with { ConfirmedAt = At.AddDays(-1) }, NotificationKind.Reminder), fuel),
            new DigestItem(new AlertNotification(Alert("refunds_vs_orders", FindingKind.CheckFailing, Severity.Critical, AlertStatus.Cleared,
                "the check runs again after 3 failures"), NotificationKind.Cleared), refunds),
        ]));
    }

    private static string Normalise(string text) => text.Replace("\r\n", "\n", StringComparison.Ordinal);

    private static string ApprovedPath(string name, [CallerFilePath] string here = "") =>
        Path.Combine(Path.GetDirectoryName(here)!, "Approved", name);

    private static void WriteReceived(MimeMessage message, string html)
    {
        var folder = Path.Combine(AppContext.BaseDirectory, "received");
        Directory.CreateDirectory(folder);
        using (var eml = File.Create(Path.Combine(folder, "alert-email.eml")))
        {
            message.WriteTo(eml);
        }

        var browsable = html;
        foreach (var image in MimeParts.Images(message))
        {
            var file = image.FileName ?? image.ContentId + ".png";
            File.WriteAllBytes(Path.Combine(folder, file), MimeParts.Bytes(image));
            browsable = browsable.Replace($"cid:{image.ContentId}", file, StringComparison.Ordinal);
        }

        Assert.DoesNotMatch(CidReference(), browsable);
        File.WriteAllText(Path.Combine(folder, "alert-email.html"), browsable);
    }

    [GeneratedRegex("src=\"cid:")]
    private static partial Regex CidReference();
}
