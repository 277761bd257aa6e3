using System.Xml;
using DriftWatch.Cli;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// Text XML cannot carry. XML 1.0 (Fifth Edition), 2.2, production [2] Char: tab, line feed, carriage return,
/// U+0020–U+D7FF, U+E000–U+FFFD and U+10000–U+10FFFF (as a surrogate pair in .NET); no escape exists for the rest.
/// </summary>
public sealed class CheckJunitTests
{
    [Theory]
    [InlineData("no such table: a\u0001b", "no such table: a\uFFFDb")]
    [InlineData("nul\u0000 and \u001F unit separator", "nul\uFFFD and \uFFFD unit separator")]
    [InlineData("tab\tline\nreturn\r pair \uD83D\uDCC8 and \uFFFD", "tab\tline\nreturn\r pair \uD83D\uDCC8 and \uFFFD")]
    public void Clean_TextOutsideXmlChars_IsReplacedAndTheRestKept(string text, string expected)
    {
        var clean = CheckJunit.Clean(text);

        Assert.Equal(expected, clean);
        AssertWritable(clean);
    }

    [Fact]
    public void Clean_LoneSurrogates_AreReplaced()
    {
        // Built in code: a lone surrogate does not survive a test runner's serialisation of inline data.
        var text = "lone " + '\uD800' + " high, lone " + '\uDC00' + " low, swapped " + '\uDC00' + '\uD800';

        var clean = CheckJunit.Clean(text);

        Assert.Equal("lone \uFFFD high, lone \uFFFD low, swapped \uFFFD\uFFFD", clean);
        AssertWritable(clean);
    }

    private static void AssertWritable(string clean)
    {
        // The framework's own checking writer (CheckCharacters on, the default) accepts what Clean returns.
        using var output = new StringWriter();
        using (var xml = XmlWriter.Create(output))
        {
            xml.WriteStartElement("r");
            xml.WriteElementString("e", clean);
            xml.WriteStartElement("f");
            xml.WriteAttributeString("a", clean);
            xml.WriteEndElement();
            xml.WriteEndElement();
        }

        Assert.Contains("<e>", output.ToString(), StringComparison.Ordinal);
    }
}
