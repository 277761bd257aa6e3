using DriftWatch.Dashboard.Health;

namespace DriftWatch.Dashboard.Pages;

/// <summary>
/// The overview's small table of the workers on this store (worker_instances): which are alive, when each was last
/// seen, what it checked last, and a note when the live ones run different configuration files.
/// </summary>
internal static class WorkersSection
{
    public static void Render(Html html, PageContext context, WorkersHealth workers)
    {
        ArgumentNullException.ThrowIfNull(html);
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(workers);
        html.Open("section", ("class", "workers"), ("aria-label", "Workers"));
        html.Element("h2", $"Workers ({workers.Alive} alive)");
        if (workers.ConfigMismatch)
        {
            html.Element("p", "The live workers run different configuration files: give every worker the same file.", ("class", "lede"));
        }

        html.Open("table", ("class", "history"));
        html.Open("thead");
        html.Open("tr");
        foreach (var head in new[] { "Worker", "Host", "PID", "State", "Last seen", "Last check", "Configuration" })
        {
            html.Element("th", head, ("scope", "col"));
        }

        html.Close("tr");
        html.Close("thead");
        html.Open("tbody");
        foreach (var worker in workers.Instances)
        {
            html.Open("tr");
            html.Element("td", worker.Id);
            html.Element("td", worker.Host);
            html.Element("td", worker.Pid.ToString(System.Globalization.CultureInfo.InvariantCulture), ("class", "num"));
            html.Element("td", worker.Alive ? "alive" : "silent");
            html.Element("td", Display.TimeWithSeconds(worker.LastSeenAt));
            html.Element("td", worker.LastPair is null ? "none yet" : $"{worker.LastPair} at {Display.TimeWithSeconds(worker.LastCheckAt ?? worker.LastSeenAt)}");
            html.Element("td", worker.ConfigSha256.Length > 12 ? worker.ConfigSha256[..12] : worker.ConfigSha256, ("class", "num"));
            html.Close("tr");
        }

        html.Close("tbody");
        html.Close("table");
        html.Close("section");
    }
}
