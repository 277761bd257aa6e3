using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;

namespace DriftWatch.Alerting.Digest;

/// <summary>
/// The JSON document a webhook mailing list receives for one digest (<c>format: full</c>, documented in
/// docs/alerting.md): what the mail says, as data. It carries summary figures only, never sampled values and never
/// a plot: where <c>alerting.public_url</c> is set, <c>dashboard_url</c> leads to the pair's page and its plot.
/// Written with the outward JSON's naming (snake_case names and enum values). Add fields at the end.
/// </summary>
internal sealed record DigestDocument(
    string Type,
    int Version,
    string Id,
    string MailingList,
    DateTimeOffset CycleAt,
    string Subject,
    string Summary,
    IReadOnlyList<DigestDocumentPair> Pairs,
    IReadOnlyList<string> Cautions)
{
    public const string DocumentType = "driftwatch.digest";
    public const int CurrentVersion = 1;
}

/// <summary>One pair of a digest: where it is read from, its alerts (worst first) and the baseline-versus-current figures.</summary>
internal sealed record DigestDocumentPair(
    string Pair,
    string Source,
    string? Table,
    string X,
    string Y,
    string? DashboardUrl,
    string? TriageUrl,
    string? Equation,
    IReadOnlyList<DigestDocumentAlert> Alerts,
    IReadOnlyList<DigestDocumentFigure> Figures);

/// <summary>
/// One alert: <paramref name="State"/> is the alert's state after this cycle (watching, confirmed, cleared);
/// <paramref name="Notice"/> is why it is in this digest (new, escalated, reminder, cleared).
/// </summary>
internal sealed record DigestDocumentAlert(
    long? Id,
    FindingKind Kind,
    string Headline,
    Severity Severity,
    AlertStatus State,
    string Notice,
    string Message,
    DateTimeOffset FirstSeen,
    DateTimeOffset? ConfirmedAt,
    DateTimeOffset? ClearedAt,
    int ConsecutiveRuns);

/// <summary>
/// One figure of the table: the values (null when undefined or unknown) and the same values as the mail shows them.
/// A pooled baseline's figures are means over its runs.
/// </summary>
internal sealed record DigestDocumentFigure(
    string Name,
    string Label,
    double? Baseline,
    double? Current,
    string BaselineText,
    string CurrentText);
