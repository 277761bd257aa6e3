using DriftWatch.Cli;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// The Markdown escaping of <c>check --format markdown</c>, held to a renderer: Markdig (CommonMark with the
/// GitHub-flavoured pipe table) must show every text exactly as written, in a table cell and in running text.
/// Rules: GitHub Flavored Markdown Spec 0.29-gfm, 4.10 (a pipe in a cell is escaped as \|, a row is one line) and
/// CommonMark 0.29, 2.4 (any ASCII punctuation may be backslash-escaped).
/// </summary>
public sealed class CheckMarkdownEscapingTests
{
    public static TheoryData<string> Hostile => new()
    {
        "a|b",
        "tail|",
        "`code` and ``two``",
        "<script>alert(1)</script>",
        "p < 0.001 & r > 0.9",
        "*stars* and _under_scores_ and ~~struck~~",
        "[a link](https://example.test) ![img](x.png)",
        @"back\slash \| and \`",
        "&amp; &lt; &#124;",
        "# not a heading",
    };

    [Theory]
    [MemberData(nameof(Hostile))]
    public void Cell_HostileText_RendersAsWrittenInOneCell(string text)
    {
        var html = MarkdownHtml.Render($"| a | b |\n|---|---|\n| {CheckMarkdown.Cell(text)} | end |\n");

        var cells = html.Descendants("tbody").Single().Elements("tr").Single().Elements("td").ToArray();
        Assert.Equal(2, cells.Length);
        Assert.Equal(text, MarkdownHtml.Text(cells[0]));
        Assert.Equal("end", MarkdownHtml.Text(cells[1]));
        Assert.DoesNotContain(cells[0].Descendants(), e => e.Name.LocalName != "br");
    }

    [Fact]
    public void Cell_LineBreaks_BecomeBreaksInsideTheCell()
    {
        var html = MarkdownHtml.Render($"| a |\n|---|\n| {CheckMarkdown.Cell("one\ntwo\r\nthree|four")} |\n| next |\n");

        var rows = html.Descendants("tbody").Single().Elements("tr").ToArray();
        Assert.Equal(2, rows.Length);
        Assert.Equal("one\ntwo\nthree|four", MarkdownHtml.Text(rows[0].Elements("td").Single()));
        Assert.Equal("next", MarkdownHtml.Text(rows[1].Elements("td").Single()));
    }

    [Fact]
    public void Cell_ControlCharacters_ShowAsReplacementCharacters()
    {
        var html = MarkdownHtml.Render($"| a |\n|---|\n| {CheckMarkdown.Cell("bell\u0007 nul\u0000 tab\tend")} |\n");

        Assert.Equal("bell\uFFFD nul\uFFFD tab\tend", MarkdownHtml.Text(html.Descendants("td").Single()));
    }

    [Theory]
    [MemberData(nameof(Hostile))]
    public void Text_HostileText_RendersAsWrittenInAListItem(string text)
    {
        var html = MarkdownHtml.Render($"- **pair**: {CheckMarkdown.Text(text)}\n- next\n");

        var items = html.Descendants("li").ToArray();
        Assert.Equal(2, items.Length);
        Assert.Equal("pair: " + text, MarkdownHtml.Text(items[0]));
        Assert.Equal(["strong"], items[0].Descendants().Select(e => e.Name.LocalName));
    }
}
