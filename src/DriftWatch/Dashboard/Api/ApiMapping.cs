using DriftWatch.Core.Alerting;
using DriftWatch.Core.History;
using DriftWatch.Dashboard.Data;
using DriftWatch.Dashboard.Pages;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Api;

/// <summary>From the read model to the API records. Every double goes through the contract's finite-or-null rule.</summary>
internal static class ApiMapping
{
    public static PairJson ToJson(PairSummary pair)
    {
        ArgumentNullException.ThrowIfNull(pair);
        return new PairJson(
            pair.Name,
            JsonContract.Name(pair.Status),
            pair.Source,
            pair.Config?.X,
            pair.Config?.Y,
            pair.Tags,
            pair.Config is not null,
            JsonContract.Finite(pair.DeltaR),
            JsonContract.Finite(pair.SlopeRatio),
            pair.OpenAlerts.Count,
            pair.WorstOpenSeverity,
            pair.Latest is null ? null : RunJson.Of(pair.Latest),
            pair.Baseline is null ? null : ToJson(pair.Baseline));
    }

    public static BaselineJson ToJson(StoredBaseline baseline)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        return new BaselineJson(
            baseline.PolicyText,
            baseline.CreatedAt,
            baseline.CoversFrom,
            baseline.CoversTo,
            baseline.RunCount,
            baseline.Accepted,
            JsonContract.Finite(baseline.MeanRunUsed),
            baseline.Points.UsedCount,
            JsonContract.ToJson(baseline.Profile));
    }

    public static DeliveryJson ToJson(OutboxEntry entry)
    {
        ArgumentNullException.ThrowIfNull(entry);
        return new DeliveryJson(
            entry.Id,
            entry.MailingList,
            JsonContract.Name(entry.Channel),
            entry.Subject,
            entry.Recipients,
            entry.CreatedAt,
            AlertsPage.DeliveryState(entry),
            entry.Attempts,
            entry.SentAt,
            entry.IsSent || entry.IsFailed ? null : entry.NextAttemptAt,
            entry.LastError);
    }

    public static AlertsResponse ToJson(AlertsOverview overview, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(overview);
        return new AlertsResponse(now, overview.ClearedSince, [.. overview.Open.Select(AlertJson.Of)], [.. overview.Cleared.Select(AlertJson.Of)], [.. overview.Deliveries.Select(ToJson)]);
    }
}
