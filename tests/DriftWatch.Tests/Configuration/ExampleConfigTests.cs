using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using YamlDotNet.RepresentationModel;

namespace DriftWatch.Tests.Configuration;

public sealed class ExampleConfigTests
{
    private static readonly string ExamplePath = Path.Combine(AppContext.BaseDirectory, "Data", "driftwatch.yaml");

    [Fact]
    public void Load_ShippedExample_HasNoErrors()
    {
        var env = new Dictionary<string, string>(StringComparer.Ordinal) { ["DRIFTWATCH_SMTP_PASSWORD"] = "example-only" };
        var result = ConfigLoader.Load(ExamplePath, name => env.GetValueOrDefault(name));
        Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
        var config = result.Config!;
        Assert.Equal(["shop", "warehouse"], config.Sources.Select(s => s.Name));
        Assert.Equal(5, config.Pairs.Count);
        Assert.Equal(["data-team", "logistics-inbox", "archive"], config.Alerting.MailingLists.Select(r => r.Name));

        // The crontab line in the example is documented as "0 */30 * * * ?".
        Assert.Equal("0 */30 * * * ?", config.FindPair("delivery-km-vs-minutes")!.Schedule);
        Assert.True(config.FindPair("net-vs-gross-total")!.Declared.Exact);
        Assert.Equal(StoreKind.Sqlite, config.Store.Kind);
    }

    [Fact]
    public void Load_ShippedExampleWithoutItsSmtpPassword_NamesTheVariable()
    {
        var result = ConfigLoader.Load(ExamplePath, _ => null);
        var error = ConfigText.Single(result);
        Assert.Equal("alerting.smtp.password", error.Key);
        Assert.Contains("DRIFTWATCH_SMTP_PASSWORD", error.Message, StringComparison.Ordinal);
    }

    /// <summary>
    /// The complete test configuration uses every key of every level, so the loader's "accepted but not
    /// read" check (MappingReader.Done) has seen each key once: a key nobody reads fails the mapping tests.
    /// </summary>
    [Fact]
    public void FullConfig_UsesEveryAcceptedKey()
    {
        var stream = new YamlStream();
        stream.Load(new StringReader(FullConfig.Yaml));
        var seen = new Dictionary<KeyLevel, HashSet<string>>();
        Walk(ConfigKeys.Root, stream.Documents[0].RootNode);
        // Thresholds are read key by key through one table; ThresholdsSectionTests sets each one in turn.
        foreach (var level in AllLevels(ConfigKeys.Root).Where(l => l != ConfigKeys.Thresholds))
        {
            var keys = seen.GetValueOrDefault(level) ?? [];
            Assert.True(level.Keys.All(keys.Contains), $"{level.Name}: not used: {string.Join(", ", level.Keys.Where(k => !keys.Contains(k)))}");
        }

        void Walk(KeyLevel level, YamlNode node)
        {
            if (node is YamlSequenceNode list)
            {
                foreach (var item in list)
                {
                    Walk(level, item);
                }

                return;
            }

            if (node is not YamlMappingNode mapping)
            {
                return;
            }

            var keys = seen.TryGetValue(level, out var set) ? set : seen[level] = [];
            foreach (var (key, value) in mapping.Children)
            {
                var name = ((YamlScalarNode)key).Value!;
                keys.Add(name);
                if (level.Child(name) is { } child)
                {
                    Walk(child, value);
                }
            }
        }
    }

    private static IEnumerable<KeyLevel> AllLevels(KeyLevel level) =>
        new[] { level }.Concat(level.Children().SelectMany(c => AllLevels(c.Child))).Distinct();
}
