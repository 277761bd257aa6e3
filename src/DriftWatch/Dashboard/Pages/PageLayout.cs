using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>The frame every page shares: head, top bar with navigation, the cautions in the footer.</summary>
internal static class PageLayout
{
    public const string NavOverview = "overview";
    public const string NavAlerts = "alerts";

    private const string FavIcon =
        "data:image/svg+xml,%3Csvg xmlns='http://www.w3.org/2000/svg' viewBox='0 0 16 16'%3E%3Cpath d='M8 1 15 8 8 15 1 8z' fill='%23e8a33d'/%3E%3C/svg%3E";

    public static string Render(PageContext context, string title, string? activeNav, Action<Html> body)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(body);
        var html = new Html();
        html.Raw("<!DOCTYPE html>");
        html.Open("html", ("lang", "en"));
        html.Open("head");
        html.Open("meta", ("charset", "utf-8"));
        html.Open("meta", ("name", "viewport"), ("content", "width=device-width, initial-scale=1"));
        html.Open("meta", ("name", "referrer"), ("content", "no-referrer"));
        html.Element("title", title + " · DriftWatch");
        // An inline icon, so browsers do not ask the server (or the disk, for an export) for /favicon.ico.
        html.Open("link", ("rel", "icon"), ("href", FavIcon));
        if (context.InlineAssets)
        {
            // The static export must open offline from a file, so CSS and script travel inside each page.
            html.Open("style").Raw(DashboardAssets.Css).Close("style");
        }
        else
        {
            html.Open("link", ("rel", "stylesheet"), ("href", DashboardAssets.CssPath));
            html.Open("script", ("src", DashboardAssets.ScriptPath), ("defer", string.Empty)).Close("script");
        }

        html.Close("head");
        html.Open("body");
        TopBar(html, context, activeNav);
        html.Open("main", ("id", "main"));
        body(html);
        html.Close("main");
        Footer(html, context);
        if (context.InlineAssets)
        {
            html.Open("script").Raw(DashboardAssets.Script).Close("script");
        }

        html.Close("body");
        html.Close("html");
        return html.ToString();
    }

    private static void TopBar(Html html, PageContext context, string? activeNav)
    {
        html.Open("header", ("class", "topbar"));
        html.Open("a", ("class", "brand"), ("href", context.Links.Overview));
        html.Element("span", "◇", ("class", "brand-mark"), ("aria-hidden", "true"));
        html.Text("DriftWatch");
        html.Close("a");
        html.Open("nav", ("aria-label", "Sections"));
        NavLink(html, context.Links.Overview, "Pairs", activeNav == NavOverview);
        NavLink(html, context.Links.Alerts, "Alerts", activeNav == NavAlerts);
        html.Close("nav");
        html.Open("div", ("class", "asof"));
        html.Text(context.InlineAssets ? "exported " : "as of ");
        html.Element("time", Display.Time(context.Now), ("datetime", Display.Iso(context.Now)));
        html.Close("div");
        if (context.ShowSignOut)
        {
            html.Open("form", ("method", "post"), ("action", "/logout"), ("class", "signout"));
            html.Element("button", "Sign out", ("type", "submit"));
            html.Close("form");
        }

        html.Close("header");
    }

    private static void NavLink(Html html, string href, string text, bool active) =>
        html.Link(href, text, ("aria-current", active ? "page" : null));

    private static void Footer(Html html, PageContext context)
    {
        html.Open("footer", ("class", "caution"));
        html.Open("p");
        html.Element("strong", Cautions.SignalsNotProof);
        html.Text(" A finding says a relationship changed in a way worth a look; the cause is for a person to establish. ");
        html.Text(Cautions.PlotsCarryData);
        html.Close("p");
        if (context.InlineAssets)
        {
            html.Element("p", "Static export: a snapshot of the history store at the time above, readable offline.");
        }

        html.Close("footer");
    }
}
