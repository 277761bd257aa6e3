using DriftWatch.Triage;

namespace DriftWatch.Dashboard.Pages;

/// <summary>
/// The sign-in form: the access token (when one is configured), exchanged for a session cookie, and the name the
/// audit log records for the actions taken in that session. A loopback dashboard without a token asks only for the name.
/// </summary>
internal static class LoginPage
{
    public static string Render(DateTimeOffset now, string? next, string? error, bool askToken = true, bool nameFromProxy = false)
    {
        var context = new PageContext(ServedLinks.Instance, InlineAssets: false, now);
        return PageLayout.Render(context, "Sign in", null, html =>
        {
            html.Open("section", ("class", "card login"));
            html.Element("h1", "Sign in");
            html.Element("p", askToken
                ? "This dashboard is reachable from other machines, so it asks for its access token (dashboard.access_token in the configuration)."
                : "Reading needs no sign-in here. To acknowledge, snooze or change a baseline, give your name: the audit log records who did what.", ("class", "muted"));
            if (error is not null)
            {
                html.Element("p", error, ("class", "callout callout-failing"), ("role", "alert"));
            }

            html.Open("form", ("method", "post"), ("action", "/login"));
            html.Open("input", ("type", "hidden"), ("name", "next"), ("value", next ?? "/"));
            if (askToken)
            {
                html.Open("label", ("class", "field field-wide"));
                html.Element("span", "Access token");
                html.Open("input", ("type", "password"), ("name", "token"), ("autocomplete", "current-password"), ("required", string.Empty), ("autofocus", string.Empty));
                html.Close("label");
            }

            if (!nameFromProxy)
            {
                html.Open("label", ("class", "field field-wide"));
                html.Element("span", "Your name (for the audit log of actions)");
                html.Open("input", ("type", "text"), ("name", "name"), ("autocomplete", "name"), ("maxlength", Actor.MaxNameLength.ToString(System.Globalization.CultureInfo.InvariantCulture)),
                    ("required", string.Empty), ("autofocus", askToken ? null : string.Empty));
                html.Close("label");
            }

            html.Element("button", "Sign in", ("type", "submit"), ("class", "apply"));
            html.Close("form");
            html.Close("section");
        });
    }
}
