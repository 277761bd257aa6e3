namespace DriftWatch.Dashboard.Pages;

/// <summary>
/// How a page is rendered: its links, whether CSS and script are linked (served) or inlined (static export),
/// the time the page describes, and whether a sign-out button applies.
/// </summary>
internal sealed record PageContext(PageLinks Links, bool InlineAssets, DateTimeOffset Now, bool ShowSignOut = false)
{
    /// <summary>
    /// Served by the dashboard (read now), not a static export (read days later): only a live page may say
    /// "4 min ago"; a static page gives absolute times, or it would say "just now" for ever.
    /// </summary>
    public bool Live => !InlineAssets;
}
