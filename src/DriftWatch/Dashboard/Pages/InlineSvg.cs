using System.Globalization;
using System.Text.RegularExpressions;
using System.Xml.Linq;

namespace DriftWatch.Dashboard.Pages;

/// <summary>
/// Makes a plot's SVG document fit for inlining into a page: no XML declaration, ids prefixed (ScottPlot
/// names its clip paths cl_1, cl_2 … per document, so two plots on one page would clip each other), a viewBox
/// so CSS can size it, an accessible name, label text without indentation. The document is parsed and re-serialised by System.Xml, so text
/// stays escaped; scripts, foreign objects and event attributes are dropped should a renderer ever emit them.
/// </summary>
internal static partial class InlineSvg
{
    private static readonly XNamespace Svg = "http://www.w3.org/2000/svg";

    public static string Prepare(string svgDocument, string idPrefix, string label, string cssClass = "plot")
    {
        ArgumentNullException.ThrowIfNull(svgDocument);
        var document = XDocument.Parse(svgDocument);
        var root = document.Root ?? throw new FormatException("The plot renderer returned an empty SVG document.");

        foreach (var element in root.DescendantsAndSelf().Where(e => e.Name.LocalName is "script" or "foreignObject").ToArray())
        {
            element.Remove();
        }

        foreach (var text in root.Descendants().Where(e => e.Name.LocalName is "text" or "tspan").SelectMany(e => e.Nodes().OfType<XText>()))
        {
            // SVG's default white-space handling drops the renderer's indentation anyway; trimmed, a label reads as one string.
            text.Value = text.Value.Trim();
        }

        foreach (var element in root.DescendantsAndSelf())
        {
            foreach (var attribute in element.Attributes().ToArray())
            {
                if (attribute.Name.LocalName.StartsWith("on", StringComparison.OrdinalIgnoreCase))
                {
                    attribute.Remove();
                }
                else if (attribute.Name.LocalName == "id")
                {
                    attribute.Value = idPrefix + attribute.Value;
                }
                else if (attribute.Value.Contains("url(#", StringComparison.Ordinal))
                {
                    attribute.Value = UrlReference().Replace(attribute.Value, m => "url(#" + idPrefix + m.Groups[1].Value + ")");
                }
                else if (attribute.Name.LocalName == "href" && attribute.Value.StartsWith('#'))
                {
                    attribute.Value = "#" + idPrefix + attribute.Value[1..];
                }
            }
        }

        var width = Size(root.Attribute("width"));
        var height = Size(root.Attribute("height"));
        if (width is not null && height is not null && root.Attribute("viewBox") is null)
        {
            root.SetAttributeValue("viewBox", string.Create(CultureInfo.InvariantCulture, $"0 0 {width} {height}"));
        }

        root.SetAttributeValue("width", null);
        root.SetAttributeValue("height", null);
        root.SetAttributeValue("class", cssClass);
        root.SetAttributeValue("role", "img");
        root.SetAttributeValue("aria-label", label);
        if (root.Name.Namespace != Svg)
        {
            throw new FormatException("The plot renderer returned something that is not SVG.");
        }

        return root.ToString(SaveOptions.DisableFormatting);
    }

    private static string? Size(XAttribute? attribute) =>
        attribute is not null && double.TryParse(attribute.Value, NumberStyles.Float, CultureInfo.InvariantCulture, out var value)
            ? value.ToString(CultureInfo.InvariantCulture)
            : null;

    [GeneratedRegex(@"url\(#([^)]+)\)", RegexOptions.CultureInvariant)]
    private static partial Regex UrlReference();
}
