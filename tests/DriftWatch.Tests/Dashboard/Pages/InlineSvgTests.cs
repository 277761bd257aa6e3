using System.Xml.Linq;
using DriftWatch.Dashboard.Pages;

namespace DriftWatch.Tests.Dashboard.Pages;

public sealed class InlineSvgTests
{
    private const string Svg =
        "<?xml version=\"1.0\" encoding=\"utf-8\" ?>" +
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"640\" height=\"420\" onload=\"alert(1)\">" +
        "<clipPath id=\"cl_1\"><rect width=\"5\" height=\"5\"/></clipPath>" +
        "<g clip-path=\"url(#cl_1)\"><text>&lt;b&gt;x</text></g><script>alert(2)</script></svg>";

    [Fact]
    public void Prepare_PrefixesIds_AddsViewBox_DropsScripts_KeepsTextEscaped()
    {
        var inline = InlineSvg.Prepare(Svg, "p1-", "a plot");

        Assert.DoesNotContain("<?xml", inline, StringComparison.Ordinal);
        var root = XElement.Parse(inline);
        Assert.Equal("0 0 640 420", root.Attribute("viewBox")!.Value);
        Assert.Null(root.Attribute("width"));
        Assert.Null(root.Attribute("onload"));
        Assert.Equal("a plot", root.Attribute("aria-label")!.Value);
        Assert.Contains("id=\"p1-cl_1\"", inline, StringComparison.Ordinal);
        Assert.Contains("clip-path=\"url(#p1-cl_1)\"", inline, StringComparison.Ordinal);
        Assert.DoesNotContain("<script", inline, StringComparison.Ordinal);
        Assert.Contains("&lt;b&gt;x", inline, StringComparison.Ordinal);
    }
}
