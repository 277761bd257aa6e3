using DriftWatch.Core.Configuration;

namespace DriftWatch.Tests.Configuration;

/// <summary>
/// <c>window.anchor</c>: read, defaulted, and refused at its place. Lines and columns are counted by hand in the
/// YAML below (1-based, as editors show them).
/// </summary>
public sealed class WindowAnchorConfigTests
{
    // Lines 1-10; the window starts on line 11, indented under the pair.
    private const string OnePair = """
        sources:
          - name: shop
            kind: sqlite
            connection: shop.db
        pairs:
          - name: a
            source: shop
            table: t
            x: u
            y: v

        """;

    private static ConfigLoadResultView Load(string window) => new(ConfigText.Parse(OnePair + window));

    [Fact]
    public void Parse_AnchorLatest_IsRead()
    {
        var loaded = Load("    window:\n      column: loaded_at\n      last: 1d\n      anchor: latest\n");

        Assert.Equal(new WindowSpec("loaded_at", TimeSpan.FromDays(1), WindowAnchor.Latest), loaded.Window);
    }

    [Fact]
    public void Parse_WithoutAnchor_EndsTheWindowNow()
    {
        var loaded = Load("    window: {column: loaded_at, last: 24h}\n");

        Assert.Equal(WindowAnchor.Now, loaded.Window!.Anchor);
        Assert.Equal(WindowSpec.DefaultAnchor, loaded.Window.Anchor);
    }

    [Fact]
    public void Parse_MisspelledAnchorValue_NamesFileLineColumnAndTheChoices()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(OnePair + "    window:\n      column: loaded_at\n      last: 1d\n      anchor: lastest\n"));

        Assert.Equal(["test.yaml:14:15: pairs[0].window.anchor: must be one of now, latest; was 'lastest' (did you mean 'latest'?)"], errors);
    }

    [Fact]
    public void Parse_MisspelledAnchorKey_NamesItWithHint()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(OnePair + "    window:\n      column: loaded_at\n      last: 1d\n      anchr: latest\n"));

        Assert.Equal(["test.yaml:14:7: pairs[0].window.anchr: unknown key 'anchr'; did you mean 'anchor'?"], errors);
    }

    private sealed record ConfigLoadResultView(DriftWatch.Configuration.ConfigLoadResult Result)
    {
        public WindowSpec? Window
        {
            get
            {
                Assert.True(Result.Ok, string.Join("\n", ConfigText.Lines(Result)));
                return Assert.Single(Result.Config!.Pairs).Window;
            }
        }
    }
}
