using System.Text.Json;
using DriftWatch.Configuration;
using Json.Schema;

namespace DriftWatch.Tests.Configuration;

/// <summary>docs/driftwatch.schema.json against the loader's keys, the JSON Schema 2020-12 meta-schema and the example.</summary>
public sealed class SchemaTests
{
    private static readonly string SchemaPath = Path.Combine(AppContext.BaseDirectory, "Data", "driftwatch.schema.json");
    private static readonly string ExamplePath = Path.Combine(AppContext.BaseDirectory, "Data", "driftwatch.yaml");

    private static JsonElement SchemaRoot() => JsonDocument.Parse(File.ReadAllText(SchemaPath)).RootElement;

    /// <summary>Follows "$ref": "#/$defs/x" and, for a list, its items, to the object schema a mapping is checked with.</summary>
    private static JsonElement Resolve(JsonElement root, JsonElement schema)
    {
        while (true)
        {
            if (schema.TryGetProperty("$ref", out var reference))
            {
                var name = reference.GetString()!;
                Assert.StartsWith("#/$defs/", name, StringComparison.Ordinal);
                schema = root.GetProperty("$defs").GetProperty(name["#/$defs/".Length..]);
            }
            else if (schema.TryGetProperty("items", out var items))
            {
                schema = items;
            }
            else
            {
                return schema;
            }
        }
    }

    private static string Describe(EvaluationResults result) =>
        string.Join("\n", (result.Details ?? []).Where(d => d.Errors is { Count: > 0 }).SelectMany(d => d.Errors!.Select(e => $"{d.InstanceLocation}: {e.Value}")));

    [Fact]
    public void Schema_PropertyNamesAtEveryLevel_MatchTheLoadersKeys()
    {
        var root = SchemaRoot();
        var checkedLevels = new List<string>();
        Check(ConfigKeys.Root, root, "(root)");
        Assert.Contains("pairs.baseline.window", checkedLevels);
        Assert.Contains("alerting.mailing_lists", checkedLevels);

        void Check(KeyLevel level, JsonElement schema, string path)
        {
            checkedLevels.Add(path);
            var properties = schema.GetProperty("properties").EnumerateObject().Select(p => p.Name).ToList();
            Assert.True(level.Keys.SequenceEqual(properties), $"{path}: loader has [{string.Join(", ", level.Keys)}], schema has [{string.Join(", ", properties)}]");
            Assert.False(schema.GetProperty("additionalProperties").GetBoolean(), $"{path}: unknown keys must be refused, as the loader does");
            foreach (var (key, child) in level.Children())
            {
                var childPath = path == "(root)" ? key : $"{path}.{key}";
                Check(child, Resolve(root, schema.GetProperty("properties").GetProperty(key)), childPath);
            }
        }
    }

    [Fact]
    public void Schema_IsValidDraft202012()
    {
        // The meta-schema shipped with JsonSchema.Net is the oracle (json-schema.org, draft 2020-12).
        var result = MetaSchemas.Draft202012.Evaluate(SchemaRoot(), new EvaluationOptions { OutputFormat = OutputFormat.List });
        Assert.True(result.IsValid, Describe(result));
    }

    [Fact]
    public void Schema_AcceptsTheExampleConfig()
    {
        var schema = JsonSchema.FromText(File.ReadAllText(SchemaPath));
        var instance = JsonSerializer.SerializeToElement(YamlToJson.Convert(File.ReadAllText(ExamplePath)));
        var result = schema.Evaluate(instance, new EvaluationOptions { OutputFormat = OutputFormat.List });
        Assert.True(result.IsValid, Describe(result));
    }

    [Theory]
    [InlineData("pairs:\n  - {name: a, source: s, table: t, x: u, y: v, smaple: {rows: 5}}\n")]
    [InlineData("store:\n  retention: 5 minutes\n")]
    [InlineData("pairs:\n  - {name: a, source: s, table: t, query: SELECT 1, x: u, y: v}\n")]
    [InlineData("pairs:\n  - {name: a, source: s, table: 'a\"; drop table x; --', x: u, y: v}\n")]
    [InlineData("pairs:\n  - {name: a, source: s, table: t, x: u, y: v, sample: {rows: 3}}\n")]
    [InlineData("pairs:\n  - {name: a, source: s, table: t, x: u, y: v, baseline: {first_runs: 5, rolling: 30d}}\n")]
    public void Schema_RefusesWhatTheLoaderRefuses(string yaml)
    {
        var schema = JsonSchema.FromText(File.ReadAllText(SchemaPath));
        var instance = JsonSerializer.SerializeToElement(YamlToJson.Convert(yaml));
        Assert.False(schema.Evaluate(instance).IsValid);
        Assert.False(ConfigText.Parse(yaml).Ok);
    }
}
