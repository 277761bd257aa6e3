namespace DriftWatch.Dashboard.Pages;

/// <summary>A page with one message: unknown pair, store unreachable.</summary>
internal static class MessagePage
{
    public static string Render(PageContext context, string title, string message)
    {
        ArgumentNullException.ThrowIfNull(context);
        return PageLayout.Render(context, title, null, html =>
        {
            html.Open("section", ("class", "card"));
            html.Element("h1", title);
            html.Element("p", message);
            html.Open("p").Link(context.Links.Overview, "Back to the pairs").Close("p");
            html.Close("section");
        });
    }
}
