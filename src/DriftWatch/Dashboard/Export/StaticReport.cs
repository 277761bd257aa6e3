using System.Text;
using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard.Data;
using DriftWatch.Dashboard.Pages;
using DriftWatch.Store;

namespace DriftWatch.Dashboard.Export;

/// <summary>What a static export wrote, relative to its folder.</summary>
internal sealed record StaticReportResult(string OutDir, IReadOnlyList<string> Files);

/// <summary>
/// The dashboard's pages as self-contained files (CSS, script and SVG inline; relative links), to attach to an
/// incident ticket or read offline: index.html, alerts.html and pairs/&lt;name&gt;.html. Read-only on the stores.
/// </summary>
internal static class StaticReport
{
    /// <summary>A static page lists this many runs at most (newest first) instead of paging.</summary>
    public const int MaxRunsPerPage = 2000;

    public static Task<StaticReportResult> WriteAsync(
        DriftWatchConfig config, IHistoryStore history, IAlertStore alerts, IOutboxStore outbox, string outDir, string? pair, CancellationToken cancellationToken) =>
        WriteAsync(config, history, alerts, outbox, outDir, pair, TimeProvider.System, cancellationToken);

    /// <param name="pair">Only this pair (its page, the overview and the alerts narrowed to it); null for all.</param>
    /// <exception cref="KeyNotFoundException">The pair is neither configured nor in the store.</exception>
    public static async Task<StaticReportResult> WriteAsync(
        DriftWatchConfig config, IHistoryStore history, IAlertStore alerts, IOutboxStore outbox, string outDir, string? pair, TimeProvider time, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(config);
        ArgumentNullException.ThrowIfNull(history);
        ArgumentNullException.ThrowIfNull(alerts);
        ArgumentNullException.ThrowIfNull(outbox);
        ArgumentException.ThrowIfNullOrWhiteSpace(outDir);
        ArgumentNullException.ThrowIfNull(time);

        var reader = new DashboardReader(config, history, alerts, outbox, time);
        var now = time.GetUtcNow();
        var rows = await reader.GetOverviewAsync(cancellationToken);
        if (pair is not null)
        {
            var resolved = await reader.ResolvePairAsync(pair, cancellationToken)
                ?? throw new KeyNotFoundException($"no pair named '{pair}' is configured or has history in the store{await reader.DidYouMeanAsync(pair, cancellationToken)}");
            rows = [.. rows.Where(r => r.Name == resolved)];
        }

        var files = SafeFileNames.For(rows.Select(r => r.Name));
        var top = new StaticLinks(files, 0);
        var written = new List<string>();
        Directory.CreateDirectory(Path.Combine(outDir, "pairs"));

        await WriteAsync(outDir, "index.html", OverviewPage.Render(new PageContext(top, true, now), rows, OverviewFilter.None), written, cancellationToken);
        var alertsView = await reader.GetAlertsAsync(pair is null ? null : rows.Single().Name, cancellationToken);
        await WriteAsync(outDir, "alerts.html", AlertsPage.Render(new PageContext(top, true, now), alertsView), written, cancellationToken);

        var inPairs = new PageContext(top.AtDepth(1), true, now);
        foreach (var row in rows)
        {
            var detail = await reader.GetPairAsync(row.Name, 1, MaxRunsPerPage, cancellationToken);
            await WriteAsync(outDir, "pairs/" + files[row.Name], PairPage.Render(inPairs, detail), written, cancellationToken);
        }

        return new StaticReportResult(outDir, written);
    }

    private static async Task WriteAsync(string outDir, string relative, string html, List<string> written, CancellationToken cancellationToken)
    {
        await File.WriteAllTextAsync(Path.Combine(outDir, relative), html, new UTF8Encoding(encoderShouldEmitUTF8Identifier: false), cancellationToken);
        written.Add(relative);
    }
}
