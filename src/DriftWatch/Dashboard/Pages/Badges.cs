using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Dashboard.Data;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>
/// Status and severity chips. Each carries its word and a glyph besides its colour, so no reader depends on
/// telling colours apart.
/// </summary>
internal static class Badges
{
    public static string StatusKey(PairStatus status) => JsonContract.Name(status);

    public static string Glyph(PairStatus status) => status switch
    {
        PairStatus.Confirmed => "▲",
        PairStatus.Failing => "✕",
        PairStatus.Unmeasurable => "∅",
        PairStatus.Watching => "◔",
        PairStatus.NoBaseline => "○",
        PairStatus.NoRuns => "·",
        _ => "✓",
    };

    public static void Status(Html html, PairStatus status)
    {
        html.Open("span", ("class", "badge st-" + StatusKey(status)));
        html.Element("span", Glyph(status), ("class", "glyph"), ("aria-hidden", "true"));
        html.Text(PairStatusRules.Label(status));
        html.Close("span");
    }

    public static void Severity(Html html, Severity severity) =>
        html.Element("span", JsonContract.Name(severity), ("class", "sev sev-" + JsonContract.Name(severity)));

    public static void AlertStatus(Html html, AlertStatus status) =>
        html.Element("span", JsonContract.Name(status), ("class", "astatus as-" + JsonContract.Name(status)));

    /// <summary>"became_perfect" reads as "became perfect" for people; the API keeps the snake_case name.</summary>
    public static string Kind(FindingKind kind) => JsonContract.Name(kind).Replace('_', ' ');
}
