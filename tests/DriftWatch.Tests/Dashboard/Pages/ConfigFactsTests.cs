using DriftWatch.Configuration;
using DriftWatch.Dashboard.Pages;

namespace DriftWatch.Tests.Dashboard.Pages;

public sealed class ConfigFactsTests
{
    [Fact]
    public void ChangedThresholds_ListsExactlyTheOverriddenOnes_UnderTheirYamlKeys()
    {
        // Through the real YAML loader, so the names shown are the keys a reader would write.
        const string yaml = """
            sources:
              - name: shop
                kind: sqlite
                connection: shop.db
            pairs:
              - name: basket
                source: shop
                table: orders
                x: items
                y: total
                thresholds:
                  alpha: 0.001
                  outlier_t: 3.5
            """;
        var loaded = ConfigLoader.Parse(yaml, "test.yaml", _ => null, Path.GetTempPath());
        Assert.True(loaded.Ok, string.Join("; ", loaded.Errors));

        var changed = ConfigFacts.ChangedThresholds(loaded.Config!.Pairs[0].Thresholds);

        Assert.Equal([("alpha", "0.001", "0.01"), ("outlier_t", "3.5", "3")], changed);
    }
}
