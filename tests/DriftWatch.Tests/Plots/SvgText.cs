using System.Xml.Linq;

namespace DriftWatch.Tests.Plots;

/// <summary>The text content of every &lt;text&gt; element, parsed as XML (so the document must be well-formed).</summary>
internal static class SvgText
{
    public static IReadOnlyList<string> Of(string svg)
    {
        var document = XDocument.Parse(svg);
        return [.. document.Descendants().Where(e => e.Name.LocalName == "text").Select(e => e.Value.Trim())];
    }
}
