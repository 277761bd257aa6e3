using System.Globalization;
using System.Text.RegularExpressions;
using DriftWatch.Configuration;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Tests.Configuration;

/// <summary>docs/configuration.md names every key and states the thresholds' defaults as the code has them.</summary>
public sealed partial class ConfigDocsTests
{
    private static readonly string Docs = File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "Data", "configuration.md"));

    [Fact]
    public void Docs_DescribeEveryKeyInATableOrHeading()
    {
        var missing = AllLevels(ConfigKeys.Root)
            .SelectMany(level => level.Keys)
            .Distinct()
            .Where(key => !Docs.Contains($"| `{key}` |", StringComparison.Ordinal) && !Docs.Contains($"## `{key}`", StringComparison.Ordinal))
            .ToList();
        Assert.True(missing.Count == 0, "not in a docs table: " + string.Join(", ", missing));
    }

    [Fact]
    public void Docs_ThresholdDefaults_MatchTheCode()
    {
        foreach (var (key, _, _) in ThresholdsSection.Entries)
        {
            var row = new Regex($@"^\| `{key}` \| `([^`]+)` \|", RegexOptions.Multiline | RegexOptions.CultureInvariant).Match(Docs);
            Assert.True(row.Success, key);
            var documented = double.Parse(row.Groups[1].Value, NumberStyles.Float, CultureInfo.InvariantCulture);
            var property = typeof(Thresholds).GetProperties().Single(p => string.Equals(Snake().Replace(p.Name, "_$1"), key, StringComparison.OrdinalIgnoreCase));
            Assert.Equal((double)property.GetValue(Thresholds.Default)!, documented);
        }
    }

    [Fact]
    public void Docs_CountThresholdDefaults_MatchTheCode()
    {
        foreach (var (key, _, _, _) in ThresholdsSection.CountEntries)
        {
            var row = new Regex($@"^\| `{key}` \| `([^`]+)` \|", RegexOptions.Multiline | RegexOptions.CultureInvariant).Match(Docs);
            Assert.True(row.Success, key);
            var property = typeof(Thresholds).GetProperties().Single(p => string.Equals(Snake().Replace(p.Name, "_$1"), key, StringComparison.OrdinalIgnoreCase));
            Assert.Equal((int)property.GetValue(Thresholds.Default)!, int.Parse(row.Groups[1].Value, CultureInfo.InvariantCulture));
        }
    }

    private static IEnumerable<KeyLevel> AllLevels(KeyLevel level) =>
        new[] { level }.Concat(level.Children().SelectMany(c => AllLevels(c.Child))).Distinct();

    [GeneratedRegex("(?<=.)([A-Z])", RegexOptions.CultureInvariant)]
    private static partial Regex Snake();
}
