using System.Net;
using System.Text.RegularExpressions;

namespace DriftWatch.Tests.Dashboard.Pages;

/// <summary>Small readers of the dashboard's own markup (its rows and cells are regular); the browser tests parse real DOM.</summary>
internal static partial class PageHtml
{
    /// <summary>The overview's rows: status key, decoded pair name, the row's markup.</summary>
    public static IReadOnlyList<(string Status, string Pair, string Markup)> OverviewRows(string html) =>
        [.. Row().Matches(html).Select(m => (m.Groups[1].Value, WebUtility.HtmlDecode(NoWordBreaks(PairName().Match(m.Value).Groups[1].Value)), m.Value))];

    /// <summary>The text of each &lt;td&gt; of a row, decoded, tags stripped.</summary>
    public static IReadOnlyList<string> Cells(string rowMarkup) =>
        [.. Cell().Matches(rowMarkup).Select(m => WebUtility.HtmlDecode(Tag().Replace(NoWordBreaks(m.Groups[1].Value), " ")).Trim())];

    /// <summary>Names carry &lt;wbr&gt; (a place to wrap, no text); the text read is without them.</summary>
    public static string NoWordBreaks(string markup) => markup.Replace("<wbr>", string.Empty, StringComparison.Ordinal);

    public static int Count(string html, string fragment) => Regex.Count(html, Regex.Escape(fragment));

    public static string Href(string rowMarkup) => WebUtility.HtmlDecode(HrefPattern().Match(rowMarkup).Groups[1].Value);

    [GeneratedRegex("<tr data-status=\"([a-z_]+)\"[^>]*>.*?</tr>", RegexOptions.Singleline)]
    private static partial Regex Row();

    [GeneratedRegex("class=\"pair-name\">(.*?)</(?:span|a)>")]
    private static partial Regex PairName();

    [GeneratedRegex("<td[^>]*>(.*?)</td>", RegexOptions.Singleline)]
    private static partial Regex Cell();

    [GeneratedRegex("<[^>]+>")]
    private static partial Regex Tag();

    [GeneratedRegex("<a href=\"([^\"]*)\" class=\"pair-name\"")]
    private static partial Regex HrefPattern();
}
