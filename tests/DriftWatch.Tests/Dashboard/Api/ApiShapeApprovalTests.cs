using System.Runtime.CompilerServices;
using System.Text;
using System.Text.Json;

namespace DriftWatch.Tests.Dashboard.Api;

/// <summary>
/// Pins the dashboard's outward JSON: every field path of every endpoint with the kinds of value seen there,
/// against api-shape.approved.txt beside this file. A renamed, removed or retyped field fails the test; a new
/// field fails it too until the approved file is updated (DRIFTWATCH_APPROVE=1 rewrites it; review the diff).
/// Values are not pinned here: the tests beside this one check them.
/// </summary>
[Collection(DashboardScenarioGroup.Name)]
public sealed class ApiShapeApprovalTests(DashboardFixture fixture)
{
    private static readonly string[] Endpoints =
    [
        "/api/pairs",
        "/api/pairs/" + DashboardScenario.Perfect + "/runs?page_size=3",
        "/api/pairs/" + DashboardScenario.Failing + "/runs?page_size=3",
        "/api/alerts",
        "/healthz",
    ];

    [Fact]
    public async Task Api_FieldNamesAndKinds_MatchTheApprovedShape()
    {
        var text = new StringBuilder();
        foreach (var endpoint in Endpoints)
        {
            var (status, body) = await fixture.Host.GetAsync(endpoint);
            Assert.Equal(200, status);
            var kinds = new SortedDictionary<string, SortedSet<string>>(StringComparer.Ordinal);
            using var json = JsonDocument.Parse(body);
            Walk(json.RootElement, "$", kinds);
            text.Append("# ").Append(endpoint.Split('?')[0].Replace(DashboardScenario.Perfect, "{name}", StringComparison.Ordinal).Replace(DashboardScenario.Failing, "{name}", StringComparison.Ordinal)).Append('\n');
            foreach (var (path, seen) in kinds)
            {
                text.Append(path).Append(": ").Append(string.Join('|', seen)).Append('\n');
            }
        }

        var approved = ApprovedPath();
        if (Environment.GetEnvironmentVariable("DRIFTWATCH_APPROVE") == "1")
        {
            await File.WriteAllTextAsync(approved, text.ToString());
        }

        Assert.True(File.Exists(approved), $"no approved shape at {approved}; run with DRIFTWATCH_APPROVE=1 once and review it");
        Assert.Equal(await File.ReadAllTextAsync(approved), text.ToString());
    }

    private static void Walk(JsonElement element, string path, SortedDictionary<string, SortedSet<string>> kinds)
    {
        switch (element.ValueKind)
        {
            case JsonValueKind.Object:
                Add(kinds, path, "object");
                foreach (var property in element.EnumerateObject())
                {
                    Walk(property.Value, path + "." + property.Name, kinds);
                }

                break;
            case JsonValueKind.Array:
                Add(kinds, path, "array");
                foreach (var item in element.EnumerateArray())
                {
                    Walk(item, path + "[]", kinds);
                }

                break;
            default:
                Add(kinds, path, element.ValueKind switch
                {
                    JsonValueKind.String => "string",
                    JsonValueKind.Number => "number",
                    JsonValueKind.True or JsonValueKind.False => "bool",
                    _ => "null",
                });
                break;
        }
    }

    private static void Add(SortedDictionary<string, SortedSet<string>> kinds, string path, string kind)
    {
        if (!kinds.TryGetValue(path, out var set))
        {
            kinds[path] = set = new SortedSet<string>(StringComparer.Ordinal);
        }

        set.Add(kind);
    }

    private static string ApprovedPath([CallerFilePath] string source = "") =>
        Path.Combine(Path.GetDirectoryName(source)!, "api-shape.approved.txt");
}
