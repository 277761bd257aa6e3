using System.Globalization;
using System.Text.RegularExpressions;

namespace DriftWatch.Tests.Dashboard.Metrics;

/// <summary>One parsed sample: its metric name, labels (unescaped) and value as written.</summary>
internal sealed record OmSample(string Name, IReadOnlyDictionary<string, string> Labels, string Value)
{
    public double Number => Value switch
    {
        "+Inf" or "+inf" or "Inf" or "inf" => double.PositiveInfinity,
        "-Inf" or "-inf" => double.NegativeInfinity,
        "NaN" or "nan" => double.NaN,
        _ => double.Parse(Value, NumberStyles.Float, CultureInfo.InvariantCulture),
    };
}

internal sealed record OmFamily(string Name, string Type, string? Unit, string? Help, IReadOnlyList<OmSample> Samples);

/// <summary>
/// A strict reader of the OpenMetrics 1.0 text format, written from the specification (prometheus/docs,
/// docs/specs/om/open_metrics_spec.md, "Text format" ABNF and the "MUST" rules of the sections named in the
/// messages below). It fails on the first rule broken, so a test passing means the exposition obeys all of them.
/// </summary>
internal static partial class OpenMetricsChecker
{
    private static readonly string[] Types = ["counter", "gauge", "histogram", "gaugehistogram", "stateset", "info", "summary", "unknown"];

    public static IReadOnlyDictionary<string, OmFamily> Parse(string text)
    {
        // "Overall Structure": UTF-8 without BOM, LF only, ends with EOF (SHOULD be "# EOF\n").
        Assert.False(text.StartsWith('\uFEFF'), "a byte order mark is not allowed");
        Assert.DoesNotContain("\r", text, StringComparison.Ordinal);
        Assert.EndsWith("# EOF\n", text, StringComparison.Ordinal);
        var lines = text[..^"# EOF\n".Length].Split('\n');
        Assert.Equal(string.Empty, lines[^1]);

        var families = new Dictionary<string, (string Type, string? Unit, string? Help, List<OmSample> Samples)>(StringComparer.Ordinal);
        var finished = new HashSet<string>(StringComparer.Ordinal);
        string? current = null;
        foreach (var line in lines[..^1])
        {
            if (line.StartsWith('#'))
            {
                var meta = Metadata().Match(line);
                Assert.True(meta.Success, $"'{line}': aside from TYPE, UNIT, HELP and the EOF line no line may begin with # (MetricFamily metadata)");
                var (kind, name, rest) = (meta.Groups[1].Value, meta.Groups[2].Value, meta.Groups[3].Value);
                if (name != current)
                {
                    Assert.False(families.ContainsKey(name), $"family {name} appears twice: MetricFamilies MUST NOT be interleaved and names MUST be unique");
                    if (current is not null)
                    {
                        finished.Add(current);
                    }

                    // TYPE SHOULD come first; we require it, since a family without TYPE would be "unknown".
                    Assert.True(kind == "TYPE", $"{name}: metadata order SHOULD be TYPE, UNIT, HELP (TYPE first)");
                    Assert.Contains(rest, Types);
                    families[name] = (rest, null, null, []);
                    current = name;
                    continue;
                }

                var family = families[name];
                Assert.True(family.Samples.Count == 0, $"{name}: metadata after samples");
                if (kind == "UNIT")
                {
                    Assert.Null(family.Unit);
                    Assert.Null(family.Help);
                    Assert.True(name.EndsWith("_" + rest, StringComparison.Ordinal), $"{name}: a unit MUST be a suffix of the family name (Unit)");
                    families[name] = family with { Unit = rest };
                }
                else
                {
                    Assert.True(kind == "HELP" && family.Help is null, $"{name}: more than one {kind} line");
                    families[name] = family with { Help = Unescape(rest, line) };
                }

                continue;
            }

            var sample = ParseSample(line);
            Assert.NotNull(current);
            Assert.True(BelongsTo(sample.Name, current!, families[current!].Type), $"sample {sample.Name} is not part of family {current} ({families[current!].Type}): suffix rules of the type's section");
            foreach (var done in finished)
            {
                Assert.False(BelongsTo(sample.Name, done, families[done].Type), $"sample {sample.Name} of finished family {done}: families MUST NOT be interleaved");
            }

            families[current!].Samples.Add(sample);
        }

        var result = families.ToDictionary(kv => kv.Key, kv => new OmFamily(kv.Key, kv.Value.Type, kv.Value.Unit, kv.Value.Help, kv.Value.Samples), StringComparer.Ordinal);
        foreach (var family in result.Values)
        {
            CheckFamily(family);
        }

        return result;
    }

    private static bool BelongsTo(string sampleName, string family, string type)
    {
        string[] suffixes = type switch
        {
            "counter" => ["_total", "_created"],
            "histogram" => ["_bucket", "_count", "_sum", "_created"],
            "summary" => ["", "_count", "_sum", "_created"],
            "info" => ["_info"],
            "gaugehistogram" => ["_bucket", "_gcount", "_gsum"],
            _ => [""],
        };
        return suffixes.Any(s => sampleName == family + s);
    }

    private static void CheckFamily(OmFamily family)
    {
        // "Metric": every Metric of a family has a unique LabelSet; "MetricPoint": metrics MUST NOT be interleaved.
        var seen = new HashSet<string>(StringComparer.Ordinal);
        var finishedSets = new HashSet<string>(StringComparer.Ordinal);
        string? currentSet = null;
        foreach (var sample in family.Samples)
        {
            Assert.True(seen.Add(sample.Name + Key(sample.Labels)), $"{family.Name}: duplicate sample {sample.Name}{Key(sample.Labels)}");
            var set = Key(sample.Labels.Where(l => l.Key != "le"));
            if (set != currentSet)
            {
                Assert.DoesNotContain(set, finishedSets);
                if (currentSet is not null)
                {
                    finishedSets.Add(currentSet);
                }

                currentSet = set;
            }
        }

        switch (family.Type)
        {
            case "counter":
                foreach (var total in family.Samples.Where(s => s.Name.EndsWith("_total", StringComparison.Ordinal)))
                {
                    // "Counter": a Total is non-NaN and starts from 0, so never negative.
                    Assert.False(double.IsNaN(total.Number));
                    Assert.True(total.Number >= 0, $"{total.Name} is negative");
                }

                break;
            case "gauge":
                Assert.All(family.Samples, s => Assert.Equal(family.Name, s.Name));
                break;
            case "histogram":
                foreach (var point in family.Samples.GroupBy(s => Key(s.Labels.Where(l => l.Key != "le"))))
                {
                    CheckHistogramPoint(family.Name, [.. point]);
                }

                break;
        }
    }

    private static void CheckHistogramPoint(string name, IReadOnlyList<OmSample> samples)
    {
        // "Histogram": at least one bucket, one with +Inf, cumulative, sorted by le, integer counts, canonical le,
        // _count equal to the +Inf bucket when a sum is present, sum not negative or NaN.
        var buckets = samples.Where(s => s.Name == name + "_bucket").ToArray();
        Assert.NotEmpty(buckets);
        Assert.All(buckets, b => Assert.True(b.Labels.ContainsKey("le"), "a bucket without le"));
        var bounds = buckets.Select(b => b.Labels["le"]).ToArray();
        Assert.Equal("+Inf", bounds[^1]);
        Assert.Equal(bounds.Length, bounds.Distinct(StringComparer.Ordinal).Count());
        var values = bounds.Select(b => b == "+Inf" ? double.PositiveInfinity : double.Parse(b, NumberStyles.Float, CultureInfo.InvariantCulture)).ToArray();
        Assert.Equal(values.Order(), values);
        foreach (var bound in bounds.Where(b => b != "+Inf"))
        {
            // Canonical numbers contain a point or an exponent (Go %g plus ".0").
            Assert.True(bound.Contains('.', StringComparison.Ordinal) || bound.Contains('e', StringComparison.Ordinal), $"le=\"{bound}\" is not canonical");
        }

        long previous = 0;
        foreach (var bucket in buckets)
        {
            Assert.True(IntegerValue().IsMatch(bucket.Value), $"bucket value {bucket.Value} is not an integer");
            var count = long.Parse(bucket.Value, CultureInfo.InvariantCulture);
            Assert.True(count >= previous, $"{name} buckets are not cumulative");
            previous = count;
        }

        var sum = samples.SingleOrDefault(s => s.Name == name + "_sum");
        var total = samples.SingleOrDefault(s => s.Name == name + "_count");
        Assert.Equal(sum is not null, total is not null);
        if (sum is not null)
        {
            Assert.Equal(previous, (long)total!.Number);
            Assert.True(sum.Number >= 0 && !double.IsNaN(sum.Number), $"{name}_sum must not be negative or NaN");
        }
    }

    private static OmSample ParseSample(string line)
    {
        // sample = metricname [labels] SP number [SP timestamp] [exemplar] LF
        var name = MetricName().Match(line);
        Assert.True(name.Success && name.Index == 0, $"'{line}': no metric name");
        var position = name.Length;
        var labels = new Dictionary<string, string>(StringComparer.Ordinal);
        if (position < line.Length && line[position] == '{')
        {
            position++;
            while (line[position] != '}')
            {
                var labelName = LabelName().Match(line, position);
                Assert.True(labelName.Success && labelName.Index == position, $"'{line}': bad label name at {position}");
                position += labelName.Length;
                Assert.True(line[position] == '=' && line[position + 1] == '"', $"'{line}': expected =\" at {position}");
                position += 2;
                var value = new System.Text.StringBuilder();
                while (line[position] != '"')
                {
                    if (line[position] == '\\')
                    {
                        var next = line[position + 1];
                        value.Append(next switch { 'n' => '\n', '"' => '"', '\\' => '\\', _ => throw new Xunit.Sdk.XunitException($"'{line}': undefined escape \\{next}") });
                        position += 2;
                    }
                    else
                    {
                        value.Append(line[position]);
                        position++;
                    }
                }

                position++;
                Assert.True(labels.TryAdd(labelName.Value, value.ToString()), $"'{line}': label names MUST be unique within a LabelSet");
                if (line[position] == ',')
                {
                    position++;
                }
            }

            position++;
        }

        Assert.True(line[position] == ' ', $"'{line}': expected a space before the value");
        var rest = line[(position + 1)..].Split(' ');
        Assert.Single(rest);
        Assert.True(Number().IsMatch(rest[0]), $"'{rest[0]}' is not a number of the ABNF");
        return new OmSample(name.Value, labels, rest[0]);
    }

    private static string Unescape(string text, string line)
    {
        var result = new System.Text.StringBuilder();
        for (var i = 0; i < text.Length; i++)
        {
            if (text[i] == '\\')
            {
                Assert.True(i + 1 < text.Length, $"'{line}': dangling backslash");
                result.Append(text[++i] switch { 'n' => '\n', '"' => '"', '\\' => '\\', var c => c });
            }
            else
            {
                result.Append(text[i]);
            }
        }

        return result.ToString();
    }

    private static string Key(IEnumerable<KeyValuePair<string, string>> labels) =>
        "{" + string.Join(",", labels.OrderBy(l => l.Key, StringComparer.Ordinal).Select(l => l.Key + "=" + l.Value)) + "}";

    [GeneratedRegex(@"^# (TYPE|UNIT|HELP) ([a-zA-Z_:][a-zA-Z0-9_:]*) (.*)$")]
    private static partial Regex Metadata();

    [GeneratedRegex(@"[a-zA-Z_:][a-zA-Z0-9_:]*")]
    private static partial Regex MetricName();

    [GeneratedRegex(@"[a-zA-Z_][a-zA-Z0-9_]*")]
    private static partial Regex LabelName();

    // realnumber of the ABNF, or (case-insensitive) [sign] inf / infinity / nan.
    [GeneratedRegex(@"^([+-]?([0-9]+(\.[0-9]*)?|[0-9]*\.[0-9]+)([eE][+-]?[0-9]+)?|[+-]?(?i:inf|infinity)|(?i:nan))$")]
    private static partial Regex Number();

    [GeneratedRegex(@"^[0-9]+$")]
    private static partial Regex IntegerValue();
}
