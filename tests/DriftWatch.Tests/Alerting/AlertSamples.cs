using DriftWatch.Alerting.Digest;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Tests.Plots;

namespace DriftWatch.Tests.Alerting;

/// <summary>
/// Digest inputs. Points and fits are Anscombe's sets I and III (see <see cref="AnscombeData"/>), with the
/// published r = 0.816, y = 3.00 + 0.500 x; pair and column names are invented.
/// </summary>
internal static class AlertSamples
{
    public static readonly DateTimeOffset At = new(2026, 3, 2, 8, 0, 0, TimeSpan.Zero);

    public static PairConfig Pair(string name = "weighed_vs_declared", string x = "declared_kg", string y = "weighed_kg", IReadOnlyList<string>? tags = null, IReadOnlyList<string>? notify = null) => new()
    {
        Name = name,
        Source = "warehouse",
        Table = "shipping.parcels",
        X = x,
        Y = y,
        Tags = tags ?? [],
        Notify = notify ?? [],
    };

    public static RelationshipProfile Baseline => new()
    {
        NRows = 11, NUsed = 11, PearsonR = 0.816, SpearmanRho = 0.818, Slope = 0.500, Intercept = 3.00, QuadraticP = 0.2, OutlierRate = 0.0,
    };

    public static RelationshipProfile Current => new()
    {
        NRows = 12, NUsed = 11, NNull = 1, PearsonR = 0.816, SpearmanRho = 0.991, Slope = 0.4997, Intercept = 3.0025, QuadraticP = 0.0004, OutlierRate = 1.0 / 11,
    };

    public static AlertPairContext Context(PairConfig? pair = null, RelationshipProfile? current = null) =>
        new(pair ?? Pair(), current ?? Current, AnscombeData.Set3, Baseline, AnscombeData.Set1);

    public static AlertState Alert(string pair, FindingKind kind, Severity severity, AlertStatus status = AlertStatus.Confirmed, string message = "something changed", long id = 0) =>
        new(id, pair, kind, severity, status, 1, At.AddHours(-1), At, At, At, status == AlertStatus.Cleared ? At : null, null, message, 7);

    public static DigestItem Item(AlertState alert, NotificationKind kind, AlertPairContext? context = null) =>
        new(new AlertNotification(alert, kind), context ?? Context(Pair(alert.Pair)));

    public static MailingListConfig MailingList(string name = "data-team", bool includePlot = true, Severity min = Severity.Warning, IReadOnlyList<string>? tags = null) => new()
    {
        Name = name,
        Recipients = ["data-team@example.org", "On Call <oncall@example.org>"],
        FromSeverity = min,
        IncludePlot = includePlot,
        Tags = tags ?? [],
    };
}
