using System.Text;
using DriftWatch.Configuration;

namespace DriftWatch.Tests.Configuration;

public sealed class YamlGuardTests
{
    /// <summary>
    /// The "billion laughs" pattern (a well-known attack on XML entities, here in YAML aliases; common
    /// practice): nine levels of nine aliases to the level below, 9^9 ≈ 387 million nodes once expanded.
    /// </summary>
    private static string AliasBomb()
    {
        var text = new StringBuilder("a: &a [\"lol\",\"lol\",\"lol\",\"lol\",\"lol\",\"lol\",\"lol\",\"lol\",\"lol\"]\n");
        for (var level = 'b'; level <= 'i'; level++)
        {
            var below = (char)(level - 1);
            text.Append(level).Append(": &").Append(level).Append(" [")
                .AppendJoin(",", Enumerable.Repeat($"*{below}", 9)).Append("]\n");
        }

        return text.Append("sources: *i\n").ToString();
    }

    [Fact]
    public void Parse_AliasBomb_IsRefusedByTheNodeBudget()
    {
        var error = ConfigText.Single(ConfigText.Parse(AliasBomb()));
        Assert.Equal(ConfigContext.FileKey, error.Key);
        Assert.Equal($"the document expands to more than {YamlGuard.MaxExpandedNodes} YAML nodes (each alias counted at every use); refused as a probable alias bomb", error.Message);

        // Level a holds 9 strings and e 9^5 = 59 049 (66 430 nodes with the lists); lines 1-5 count 74 738
        // nodes, so the first *e on line 6 passes the budget of 100 000, long before anything is expanded.
        Assert.Equal(6, error.Line);
        Assert.Equal(8, error.Column);
    }

    [Fact]
    public void Parse_ModestAliases_AreFine()
    {
        var result = ConfigText.Parse(ConfigText.SqliteSource + """

            pairs:
              - name: a
                source: shop
                table: t
                x: u
                y: v
                tags: &common [orders, finance]
              - name: b
                source: shop
                table: t2
                x: u
                y: v
                tags: *common
            """);
        Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
        Assert.Equal(["orders", "finance"], result.Config!.Pairs[1].Tags);
    }

    [Fact]
    public void Parse_AliasCycle_IsRefused()
    {
        var error = ConfigText.Single(ConfigText.Parse("sources: &x [*x]\n"));
        Assert.Equal("test.yaml:1:14: (file): alias *x refers to a node that contains it; cycles are not allowed", error.ToString());
    }

    [Fact]
    public void Parse_UnknownAlias_IsRefused()
    {
        var error = ConfigText.Single(ConfigText.Parse("sources: *nothing\n"));
        Assert.Equal("test.yaml:1:10: (file): alias *nothing refers to no anchor &nothing before it", error.ToString());
    }

    [Fact]
    public void Parse_DeepNesting_IsRefusedBeforeTheRecursiveLoader()
    {
        var yaml = "sources: " + new string('[', 10_000) + new string(']', 10_000) + "\n";
        var error = ConfigText.Single(ConfigText.Parse(yaml));
        Assert.Equal($"nesting deeper than {YamlGuard.MaxDepth} levels; a configuration never needs that much", error.Message);
    }

    [Fact]
    public void Parse_TextOverTheSizeCap_IsRefused()
    {
        var yaml = "# " + new string('x', ConfigLoader.MaxFileBytes) + "\n";
        var error = ConfigText.Single(ConfigText.Parse(yaml));
        Assert.Equal(0, error.Line);
        Assert.StartsWith("the text has ", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Parse_TwoDocuments_IsRefused()
    {
        var error = ConfigText.Single(ConfigText.Parse("store: {}\n---\nstore: {}\n"));
        Assert.Equal("the file holds more than one YAML document ('---'); put everything in one", error.Message);
    }

    [Fact]
    public void Parse_ScannerFailureThatIsNotAYamlException_BecomesAnError()
    {
        // YamlDotNet 18 throws InvalidOperationException from its scanner for this text.
        var error = ConfigText.Single(ConfigText.Parse("a: [1, 2\nb: 'secret-in-quote"));
        Assert.StartsWith("YAML syntax:", error.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("secret-in-quote", error.ToString(), StringComparison.Ordinal);
    }
}
