using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;

namespace DriftWatch.Alerting.Digest;

/// <summary>The words a digest uses for kinds, transitions and severities (our own wording).</summary>
internal static class AlertWording
{
    /// <summary>A verb phrase that follows the pair's name: "orders_vs_refunds became perfect".</summary>
    public static string Phrase(FindingKind kind) => kind switch
    {
        FindingKind.PerfectRelationship => "is an exact function",
        FindingKind.Curvature => "is curved",
        FindingKind.Outliers => "has outliers",
        FindingKind.SinglePointLeverage => "hangs on a single point",
        FindingKind.ExactnessLost => "stopped being exact",
        FindingKind.BecamePerfect => "became perfect",
        FindingKind.PartlyDerived => "became partly derived",
        FindingKind.CorrelationShift => "changed correlation",
        FindingKind.SignFlip => "flipped sign",
        FindingKind.RelationshipLost => "lost its relationship",
        FindingKind.SlopeShift => "changed slope",
        FindingKind.OffsetShift => "moved its offset",
        FindingKind.CurvatureAppeared => "became curved",
        FindingKind.OutlierSurge => "gained outliers",
        FindingKind.LeverageAppeared => "now hangs on a single point",
        FindingKind.NullSurge => "gained nulls",
        FindingKind.SampleShrank => "lost rows",
        FindingKind.HiddenRowsDriveLine => "is driven by rows outside the sample",
        FindingKind.MarginalShift => "changed distribution",
        FindingKind.CheckFailing => "cannot be checked",
        _ => kind.ToString(),
    };

    /// <summary>What changed, as a short headline for the subject: "orders_vs_refunds: slope changed".</summary>
    public static string Headline(FindingKind kind) => kind switch
    {
        FindingKind.PerfectRelationship => "exact function",
        FindingKind.Curvature => "curved",
        FindingKind.Outliers => "outliers",
        FindingKind.SinglePointLeverage => "hangs on a single point",
        FindingKind.ExactnessLost => "no longer exact",
        FindingKind.BecamePerfect => "became perfect",
        FindingKind.PartlyDerived => "partly derived",
        FindingKind.CorrelationShift => "correlation changed",
        FindingKind.SignFlip => "sign flipped",
        FindingKind.RelationshipLost => "relationship lost",
        FindingKind.SlopeShift => "slope changed",
        FindingKind.OffsetShift => "offset moved",
        FindingKind.CurvatureAppeared => "became curved",
        FindingKind.OutlierSurge => "more outliers",
        FindingKind.LeverageAppeared => "now hangs on a single point",
        FindingKind.NullSurge => "more nulls",
        FindingKind.SampleShrank => "fewer rows",
        FindingKind.HiddenRowsDriveLine => "line driven by rows outside the sample",
        FindingKind.MarginalShift => "distribution changed",
        FindingKind.CheckFailing => "cannot be checked",
        _ => kind.ToString(),
    };

    public static string Transition(NotificationKind kind) => kind switch
    {
        NotificationKind.Confirmed => "new",
        NotificationKind.Escalated => "escalated",
        NotificationKind.Reminder => "reminder",
        NotificationKind.Cleared => "cleared",
        _ => kind.ToString(),
    };

    public static string SeverityLabel(Severity severity) => severity switch
    {
        Severity.Critical => "CRITICAL",
        Severity.Warning => "WARNING",
        _ => "INFO",
    };

    /// <summary>Badge colours for the HTML body (text stays readable without them).</summary>
    public static string SeverityColour(Severity severity) => severity switch
    {
        Severity.Critical => "#B91C1C",
        Severity.Warning => "#B45309",
        _ => "#475569",
    };

    /// <summary>The badge colour of an all-clear notice.</summary>
    public const string ClearedColour = "#15803D";
}
