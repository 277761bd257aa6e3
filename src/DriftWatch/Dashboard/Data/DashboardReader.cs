using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Store;

namespace DriftWatch.Dashboard.Data;

/// <summary>
/// Reads what the pages and the API show from the history and alert stores. Never writes: the dashboard is a
/// window on what the checks recorded. Pairs are the configured ones plus any the store still has history for.
/// </summary>
internal sealed class DashboardReader(DriftWatchConfig config, IHistoryStore history, IAlertStore alerts, IOutboxStore outbox, TimeProvider time)
{
    public const int DefaultPageSize = 50;

    /// <summary>Runs drawn on the trend charts.</summary>
    public const int TrendRuns = 500;

    /// <summary>Recent runs searched for one that still has its sampled points (older ones lose them to retention).</summary>
    public const int PlotLookback = 10;

    /// <summary>Cleared alerts stay on the alerts page this long.</summary>
    public static readonly TimeSpan RecentAlerts = TimeSpan.FromDays(7);

    public const int MaxAlerts = 500;

    public const int MaxDeliveries = 200;

    public DriftWatchConfig Config => config;

    public TimeProvider Time => time;

    /// <summary>Every pair, worst first by <see cref="OverviewRanking"/>.</summary>
    public async Task<IReadOnlyList<PairSummary>> GetOverviewAsync(CancellationToken cancellationToken)
    {
        var latest = (await history.GetLatestRunsAsync(cancellationToken)).ToDictionary(r => r.Pair, StringComparer.Ordinal);
        var open = await alerts.GetOpenAlertsAsync(null, cancellationToken);
        var names = config.Pairs.Select(p => p.Name).Concat(latest.Keys.Order(StringComparer.Ordinal)).Distinct(StringComparer.Ordinal);
        var rows = new List<PairSummary>();
        foreach (var name in names)
        {
            var baseline = await history.GetBaselineAsync(name, cancellationToken);
            var pairAlerts = open.Where(a => a.Pair == name).OrderByDescending(a => a.Severity).ThenBy(a => a.FirstSeen).ToArray();
            var run = latest.GetValueOrDefault(name);
            rows.Add(new PairSummary(name, config.FindPair(name), PairStatusRules.Derive(run, pairAlerts, baseline is not null), run, baseline, pairAlerts));
        }

        return OverviewRanking.Order(rows);
    }

    /// <summary>
    /// The pair a URL path segment names, or null. A '/' in a name reaches the endpoint as "%2F" (the server does not
    /// decode it in paths), so that spelling is tried too.
    /// </summary>
    public async Task<string?> ResolvePairAsync(string segment, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(segment);
        string[] candidates = segment.Contains("%2F", StringComparison.OrdinalIgnoreCase)
            ? [segment, segment.Replace("%2F", "/", StringComparison.OrdinalIgnoreCase)]
            : [segment];
        foreach (var candidate in candidates)
        {
            if (config.FindPair(candidate) is not null || await history.CountRunsAsync(candidate, cancellationToken) > 0)
            {
                return candidate;
            }
        }

        return null;
    }

    /// <summary>
    /// " (did you mean 'NAME'?)" for a pair name that resolves to nothing, from the configured pairs and those with
    /// history; empty when none is close. The same hint as the command line's.
    /// </summary>
    public async Task<string> DidYouMeanAsync(string unknown, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(unknown);
        var latest = await history.GetLatestRunsAsync(cancellationToken);
        var names = config.Pairs.Select(p => p.Name).Concat(latest.Select(r => r.Pair));
        return Configuration.KeyHints.DidYouMean(unknown, names);
    }

    /// <summary>The pair page's data; <paramref name="page"/> is 1-based and clamped to the pages there are.</summary>
    public async Task<PairDetail> GetPairAsync(string name, int page, int pageSize, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(name);
        pageSize = Math.Clamp(pageSize, 1, 1000);
        var total = await history.CountRunsAsync(name, cancellationToken);
        var pageCount = Math.Max(1, (total + pageSize - 1) / pageSize);
        page = Math.Clamp(page, 1, pageCount);

        // One query serves the chart and the page; the store pages by time, so a page is the tail of a longer read.
        var wanted = Math.Max(TrendRuns, page * pageSize);
        var runs = await history.GetRunsAsync(name, wanted, includePoints: false, cancellationToken);
        var pageRuns = runs.Skip((page - 1) * pageSize).Take(pageSize).ToArray();
        var trend = runs.Take(TrendRuns).ToArray();

        var withPoints = await history.GetRunsAsync(name, PlotLookback, includePoints: true, cancellationToken);
        var plotRun = withPoints.FirstOrDefault(r => r.Status == RunStatus.Succeeded && r.Points is { UsedCount: > 0 });

        var baseline = await history.GetBaselineAsync(name, cancellationToken);
        var open = await alerts.GetOpenAlertsAsync([name], cancellationToken);
        var latest = runs.Count > 0 ? runs[0] : null;
        var summary = new PairSummary(name, config.FindPair(name), PairStatusRules.Derive(latest, open, baseline is not null), latest, baseline, open);
        var recent = await alerts.ListAlertsAsync(time.GetUtcNow() - RecentAlerts, MaxAlerts, cancellationToken, name);
        int? needed = null;
        if (baseline is null && summary.Config?.Baseline is { Kind: BaselinePolicyKind.FirstRuns } policy)
        {
            // The runs the policy would pool, counted as it counts them: succeeded (never failed or unmeasurable), with points.
            var good = await history.GetSuccessfulRunsAsync(name, null, null, policy.FirstRuns, cancellationToken);
            needed = Math.Max(0, policy.FirstRuns - good.Count(r => r.Points is { UsedCount: > 0 }));
        }

        return new PairDetail(summary, pageRuns, page, pageSize, total, trend, plotRun, recent, needed);
    }

    /// <summary>
    /// Open alerts in <see cref="Output.AlertListing"/>'s order and without info sightings (as <c>alerts list</c>),
    /// recently cleared ones and the outbox; of one pair only when <paramref name="pair"/> is set.
    /// </summary>
    public async Task<AlertsOverview> GetAlertsAsync(string? pair, CancellationToken cancellationToken)
    {
        var since = time.GetUtcNow() - RecentAlerts;
        var listed = await alerts.ListAlertsAsync(since, MaxAlerts, cancellationToken, pair);
        var deliveries = await outbox.ListOutboxAsync(unsentOnly: false, MaxDeliveries, cancellationToken);
        return new AlertsOverview(
            [.. Output.AlertListing.Arrange(listed.Where(a => a.IsOpen))],
            [.. listed.Where(a => !a.IsOpen).OrderByDescending(a => a.ClearedAt)],
            since,
            deliveries);
    }
}
