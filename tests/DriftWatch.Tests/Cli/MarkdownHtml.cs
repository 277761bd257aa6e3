using System.Text;
using System.Xml.Linq;
using Markdig;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// Markdown rendered to HTML by Markdig with GitHub-flavoured pipe tables, read back as XML so tests assert cells
/// and links rather than the Markdown text.
/// </summary>
internal static class MarkdownHtml
{
    private static readonly MarkdownPipeline Pipeline = new MarkdownPipelineBuilder().UsePipeTables().Build();

    public static XElement Render(string markdown)
    {
        // Markdig passes inline HTML through as written: <br> is HTML, not XML, so it is closed before parsing.
        var html = Markdown.ToHtml(markdown, Pipeline).Replace("<br>", "<br/>", StringComparison.Ordinal);
        return XElement.Parse("<root>" + html + "</root>");
    }

    /// <summary>The text a reader sees: text nodes in order, a line break for each &lt;br&gt;, edges trimmed.</summary>
    public static string Text(XElement element)
    {
        var text = new StringBuilder();
        foreach (var node in element.DescendantNodes())
        {
            if (node is XText t)
            {
                text.Append(t.Value);
            }
            else if (node is XElement { Name.LocalName: "br" })
            {
                text.Append('\n');
            }
        }

        return text.ToString().Trim();
    }
}
