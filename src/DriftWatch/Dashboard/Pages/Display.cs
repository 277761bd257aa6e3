using System.Globalization;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>
/// Times as the pages print them, invariant culture, every one UTC. Figures (numbers) come from
/// <see cref="Figures"/>, the formatter the CLI, the digest and the plots share.
/// </summary>
internal static class Display
{
    /// <summary>"2026-12-02 14:05 UTC".</summary>
    public static string Time(DateTimeOffset at) => Figures.Time(at);

    public static string Time(DateTimeOffset? at) => at is { } t ? Time(t) : Figures.Missing;

    /// <summary>"2026-12-02 14:05:09 UTC": history rows, where runs may be minutes apart.</summary>
    public static string TimeWithSeconds(DateTimeOffset at) =>
        at.ToUniversalTime().ToString("yyyy-MM-dd HH:mm:ss", CultureInfo.InvariantCulture) + " UTC";

    /// <summary>The machine-readable form for &lt;time datetime&gt; and sort keys.</summary>
    public static string Iso(DateTimeOffset at) => at.ToUniversalTime().ToString("yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture);

    /// <summary>"just now", "4 min ago", "3 h ago", "2 d ago"; "in 5 min" for a clock that runs behind the store's.</summary>
    public static string Relative(DateTimeOffset at, DateTimeOffset now)
    {
        var span = now - at;
        var future = span < TimeSpan.Zero;
        var size = future ? -span : span;
        string amount;
        if (size < TimeSpan.FromMinutes(1))
        {
            return "just now";
        }
        else if (size < TimeSpan.FromHours(1))
        {
            amount = Whole(size.TotalMinutes) + " min";
        }
        else if (size < TimeSpan.FromDays(2))
        {
            amount = Whole(size.TotalHours) + " h";
        }
        else
        {
            amount = Whole(size.TotalDays) + " d";
        }

        return future ? "in " + amount : amount + " ago";
    }

    public static string Duration(TimeSpan span) =>
        span < TimeSpan.FromSeconds(1)
            ? Whole(span.TotalMilliseconds) + " ms"
            : span.TotalSeconds.ToString("0.0", CultureInfo.InvariantCulture) + " s";

    /// <summary>A sort key for a number: invariant round-trip text, empty when undefined (sorted last).</summary>
    public static string SortKey(double? value) =>
        value is { } v && double.IsFinite(v) ? v.ToString("R", CultureInfo.InvariantCulture) : string.Empty;

    public static string SortKey(long value) => value.ToString(CultureInfo.InvariantCulture);

    private static string Whole(double value) => Math.Floor(value).ToString("0", CultureInfo.InvariantCulture);
}
