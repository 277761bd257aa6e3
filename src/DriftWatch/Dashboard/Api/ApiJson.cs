using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Api;

// The dashboard's JSON API. Names are snake_case by JsonContract's naming policy; runs, alerts, profiles and findings
// use the shared records of Output (RunJson, AlertJson, ProfileJson, FindingJson) unchanged, so a script reads the
// same fields as from `driftwatch history|alerts list|profile --format json`. Only the envelopes live here. Add fields at the end; the shape is pinned by an approval test.

/// <summary>GET /api/pairs.</summary>
internal sealed record PairsResponse(DateTimeOffset GeneratedAt, IReadOnlyList<PairJson> Pairs);

internal sealed record PairJson(
    string Name,
    string Status,
    string? Source,
    string? X,
    string? Y,
    IReadOnlyList<string> Tags,
    bool Configured,
    double? DeltaR,
    double? SlopeRatio,
    int OpenAlerts,
    Severity? WorstOpenSeverity,
    RunJson? LatestRun,
    BaselineJson? Baseline);

internal sealed record BaselineJson(
    string Policy,
    DateTimeOffset CreatedAt,
    DateTimeOffset CoversFrom,
    DateTimeOffset CoversTo,
    int RunCount,
    bool Accepted,
    double? MeanRunUsed,
    int Points,
    ProfileJson Profile);

/// <summary>GET /api/pairs/{name}/runs.</summary>
internal sealed record RunsResponse(string Pair, int Page, int PageSize, int PageCount, int TotalRuns, IReadOnlyList<RunJson> Runs);

/// <summary>GET /api/alerts.</summary>
internal sealed record AlertsResponse(
    DateTimeOffset GeneratedAt,
    DateTimeOffset ClearedSince,
    IReadOnlyList<AlertJson> Open,
    IReadOnlyList<AlertJson> Cleared,
    IReadOnlyList<DeliveryJson> Deliveries);

internal sealed record DeliveryJson(
    long Id,
    string MailingList,
    string Channel,
    string Subject,
    IReadOnlyList<string> Recipients,
    DateTimeOffset CreatedAt,
    string State,
    int Attempts,
    DateTimeOffset? SentAt,
    DateTimeOffset? NextAttemptAt,
    string? LastError);

internal sealed record ErrorJson(string Error);
