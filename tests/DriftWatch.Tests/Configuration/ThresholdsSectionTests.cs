using System.Reflection;
using System.Text;
using DriftWatch.Configuration;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Tests.Configuration;

public sealed class ThresholdsSectionTests
{
    private static readonly PropertyInfo[] Members =
        [.. typeof(Thresholds).GetProperties(BindingFlags.Public | BindingFlags.Instance).Where(p => p.PropertyType == typeof(double))];

    private static readonly PropertyInfo[] CountMembers =
        [.. typeof(Thresholds).GetProperties(BindingFlags.Public | BindingFlags.Instance).Where(p => p.PropertyType == typeof(int))];

    private static string SnakeCase(string name)
    {
        var text = new StringBuilder();
        foreach (var c in name)
        {
            if (char.IsUpper(c) && text.Length > 0)
            {
                text.Append('_');
            }

            text.Append(char.ToLowerInvariant(c));
        }

        return text.ToString();
    }

    [Fact]
    public void Keys_CoverEveryThresholdMember()
    {
        // Every public member is a double or a whole-number count; nothing else could be read from YAML.
        Assert.Equal(typeof(Thresholds).GetProperties(BindingFlags.Public | BindingFlags.Instance).Length, Members.Length + CountMembers.Length);
        Assert.Equal(
            Members.Concat(CountMembers).Select(m => SnakeCase(m.Name)).Order(StringComparer.Ordinal),
            ThresholdsSection.Keys.Order(StringComparer.Ordinal));
    }

    [Fact]
    public void Read_EachCountKey_SetsItsOwnMember()
    {
        foreach (var member in CountMembers)
        {
            var key = SnakeCase(member.Name);
            var entry = ThresholdsSection.CountEntries.Single(e => e.Key == key);
            var value = entry.Min + 4;
            Assert.NotEqual((int)member.GetValue(Thresholds.Default)!, value);
            var result = ConfigText.Parse(ConfigText.SqliteSource + $"\ndefaults:\n  thresholds:\n    {key}: {value}\npairs:\n  - name: a\n    source: shop\n    table: t\n    x: u\n    y: v\n");
            Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
            var thresholds = result.Config!.Pairs[0].Thresholds;
            Assert.Equal(value, (int)member.GetValue(thresholds)!);
            Assert.Equal(Thresholds.Default with { MinUsableRows = thresholds.MinUsableRows }, thresholds);
        }
    }

    [Fact]
    public void Read_MinUsableRowsOutOfRangeOrFractional_SaysWhy()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(ConfigText.SqliteSource + "\ndefaults:\n  thresholds:\n    min_usable_rows: 2\npairs:\n  - name: a\n    source: shop\n    table: t\n    x: u\n    y: v\n    thresholds:\n      min_usable_rows: 10.5\n"));
        Assert.Contains("test.yaml:7:22: defaults.thresholds.min_usable_rows: must be at least 3, was 2", errors);
        Assert.Contains(errors, e => e.Contains("pairs[0].thresholds.min_usable_rows: must be a whole number, was '10.5'", StringComparison.Ordinal));
    }

    [Fact]
    public void Read_MinUsableRowsAboveSampleRows_Refused()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(ConfigText.SqliteSource + "\npairs:\n  - name: a\n    source: shop\n    table: t\n    x: u\n    y: v\n    sample: { method: random, rows: 50 }\n    thresholds: { min_usable_rows: 100 }\n"));
        Assert.Contains(errors, e => e.Contains("min_usable_rows (100) is more than sample.rows (50)", StringComparison.Ordinal));
    }

    /// <summary>Each key sets its own member and no other, read through the YAML like a user writes it.</summary>
    [Fact]
    public void Read_EachKey_SetsItsOwnMember()
    {
        foreach (var member in Members)
        {
            var key = SnakeCase(member.Name);
            var entry = ThresholdsSection.Entries.Single(e => e.Key == key);

            // A value inside every range that differs from every default.
            const double Value = 0.3125;
            Assert.True(entry.Range.Contains(Value), key);
            var result = ConfigText.Parse(ConfigText.SqliteSource + $"\ndefaults:\n  thresholds:\n    {key}: {Value}\npairs:\n  - name: a\n    source: shop\n    table: t\n    x: u\n    y: v\n");
            Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
            var thresholds = result.Config!.Pairs[0].Thresholds;
            foreach (var other in Members)
            {
                var expected = other == member ? Value : (double)other.GetValue(Thresholds.Default)!;
                Assert.Equal(expected, (double)other.GetValue(thresholds)!);
            }
        }
    }

    [Fact]
    public void Read_OutOfRange_SaysTheRange()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(ConfigText.SqliteSource + "\ndefaults:\n  thresholds:\n    alpha: 1.5\n    outlier_t: 0\n"));
        Assert.Equal(
            [
                "test.yaml:7:12: defaults.thresholds.alpha: must be between 0 and 1, exclusive, was 1.5",
                "test.yaml:8:16: defaults.thresholds.outlier_t: must be greater than 0, was 0",
            ],
            errors);
    }
}
