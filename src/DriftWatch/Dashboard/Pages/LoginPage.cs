namespace DriftWatch.Dashboard.Pages;

/// <summary>The one form of the dashboard: the access token, exchanged for a session cookie.</summary>
internal static class LoginPage
{
    public static string Render(DateTimeOffset now, string? next, string? error)
    {
        var context = new PageContext(ServedLinks.Instance, InlineAssets: false, now);
        return PageLayout.Render(context, "Sign in", null, html =>
        {
            html.Open("section", ("class", "card login"));
            html.Element("h1", "Sign in");
            html.Element("p", "This dashboard is reachable from other machines, so it asks for its access token (dashboard.access_token in the configuration).", ("class", "muted"));
            if (error is not null)
            {
                html.Element("p", error, ("class", "callout callout-failing"), ("role", "alert"));
            }

            html.Open("form", ("method", "post"), ("action", "/login"));
            html.Open("input", ("type", "hidden"), ("name", "next"), ("value", next ?? "/"));
            html.Open("label", ("class", "field field-wide"));
            html.Element("span", "Access token");
            html.Open("input", ("type", "password"), ("name", "token"), ("autocomplete", "current-password"), ("required", string.Empty), ("autofocus", string.Empty));
            html.Close("label");
            html.Element("button", "Sign in", ("type", "submit"), ("class", "apply"));
            html.Close("form");
            html.Close("section");
        });
    }
}
