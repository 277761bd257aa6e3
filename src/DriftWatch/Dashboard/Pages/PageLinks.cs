using System.Globalization;

namespace DriftWatch.Dashboard.Pages;

/// <summary>Where the pages link to: server paths, or relative file names in a static export.</summary>
internal abstract class PageLinks
{
    public abstract string Overview { get; }

    public abstract string Alerts { get; }

    /// <summary>Whether history tables are paged (a static export shows one long page instead).</summary>
    public abstract bool Paged { get; }

    /// <summary>The overview pre-filtered to one status (the tally tiles link here).</summary>
    public string OverviewWithStatus(string status) => Overview + "?status=" + Uri.EscapeDataString(status);

    /// <summary>Null when the pair has no page (a static export of another pair).</summary>
    public abstract string? Pair(string name, int page = 1);
}

/// <summary>Links of the served dashboard: absolute paths, pair names escaped into one path segment.</summary>
internal sealed class ServedLinks : PageLinks
{
    public static ServedLinks Instance { get; } = new();

    public override string Overview => "/";

    public override string Alerts => "/alerts";

    public override bool Paged => true;

    public override string? Pair(string name, int page = 1) =>
        "/pairs/" + Uri.EscapeDataString(name) + (page > 1 ? "?page=" + page.ToString(CultureInfo.InvariantCulture) : string.Empty);
}

/// <summary>
/// Links between the files of a static export: index.html and alerts.html at the top, pairs/&lt;file&gt;.html
/// one level down. <paramref name="depth"/> is the linking page's depth (0 at the top, 1 in pairs/).
/// </summary>
internal sealed class StaticLinks(IReadOnlyDictionary<string, string> pairFiles, int depth) : PageLinks
{
    private string Up => depth == 0 ? string.Empty : "../";

    public override string Overview => Up + "index.html";

    public override string Alerts => Up + "alerts.html";

    public override bool Paged => false;

    public override string? Pair(string name, int page = 1) =>
        pairFiles.TryGetValue(name, out var file) ? (depth == 0 ? "pairs/" : string.Empty) + Uri.EscapeDataString(file) : null;

    public StaticLinks AtDepth(int newDepth) => new(pairFiles, newDepth);
}
