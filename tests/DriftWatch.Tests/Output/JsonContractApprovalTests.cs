using System.Text.Json;
using DriftWatch.Tests.Cli;

namespace DriftWatch.Tests.Output;

/// <summary>
/// Pins the JSON of <c>driftwatch profile</c> against the approved file Data/expected/profile_anscombe_set1.json.
/// Names, their order, nesting and value kinds must match exactly: that is the contract scripts depend
/// on. Numbers match within a relative 1e-9 (absolute 1e-12 near zero) rather than digit for digit, so
/// a harmless change of summation order in the engine, which moves the last bits, does not fail the
/// contract, while any real change of a figure does. Strings match exactly.
/// To approve a deliberate change, run the command in the file's header line and review the diff.
/// </summary>
public sealed class JsonContractApprovalTests
{
    private const double RelativeTolerance = 1e-9;
    private const double AbsoluteTolerance = 1e-12;

    [Fact]
    public async Task ProfileJson_AnscombeSet1_MatchesApprovedFile()
    {
        // dotnet run --project src/DriftWatch -- profile --csv tests/DriftWatch.Tests/Data/anscombe_set1.csv --x x --y y --format json
        var run = await CliRun.Of("profile", "--csv", TestData.Path("anscombe_set1.csv"), "--x", "x", "--y", "y", "--format", "json");
        var approved = JsonDocument.Parse(File.ReadAllText(TestData.Path("expected", "profile_anscombe_set1.json"))).RootElement;
        var received = JsonDocument.Parse(run.Out).RootElement;

        var differences = new List<string>();
        Compare("$", approved, received, differences);

        Assert.True(differences.Count == 0, "JSON differs from the approved file:\n" + string.Join('\n', differences) + "\nreceived:\n" + run.Out);

        // The approved numbers are themselves checked against the published figures of the data set:
        // Anscombe (1973): r = 0.816, y = 3.00 + 0.500x, mean x = 9, variance x = 11, mean y = 7.50.
        var current = approved.GetProperty("current");
        Assert.Equal(0.816, current.GetProperty("pearson_r").GetDouble(), 0.0005);
        Assert.Equal(3.00, current.GetProperty("intercept").GetDouble(), 0.005);
        Assert.Equal(0.500, current.GetProperty("slope").GetDouble(), 0.0005);
        Assert.Equal(9, current.GetProperty("x_mean").GetDouble(), 1e-12);
        Assert.Equal(11, Math.Pow(current.GetProperty("x_sd").GetDouble(), 2), 1e-9);
        Assert.Equal(7.50, current.GetProperty("y_mean").GetDouble(), 0.005);
        // r² = R² for a simple linear regression (common practice).
        Assert.Equal(Math.Pow(current.GetProperty("pearson_r").GetDouble(), 2), current.GetProperty("r_squared").GetDouble(), 1e-12);
    }

    [Fact]
    public void Compare_ChangedNumberOrMissingKey_Reported()
    {
        // The comparison itself must catch what it is meant to catch.
        var approved = JsonDocument.Parse("""{"a": 1.0, "b": [true, null], "c": "s"}""").RootElement;
        var differences = new List<string>();

        Compare("$", approved, JsonDocument.Parse("""{"a": 1.000001, "b": [true, 0], "d": "s"}""").RootElement, differences);

        Assert.Equal(["$ keys: expected [a, b, c], got [a, b, d]", "$.a: expected 1, got 1.000001", "$.b[1]: expected Null, got Number"], differences);
    }

    private static void Compare(string path, JsonElement expected, JsonElement actual, List<string> differences)
    {
        if (expected.ValueKind != actual.ValueKind && !(IsBool(expected) && IsBool(actual)))
        {
            differences.Add($"{path}: expected {expected.ValueKind}, got {actual.ValueKind}");
            return;
        }

        switch (expected.ValueKind)
        {
            case JsonValueKind.Object:
                var expectedKeys = expected.EnumerateObject().Select(p => p.Name).ToList();
                var actualKeys = actual.EnumerateObject().Select(p => p.Name).ToList();
                if (!expectedKeys.SequenceEqual(actualKeys))
                {
                    differences.Add($"{path} keys: expected [{string.Join(", ", expectedKeys)}], got [{string.Join(", ", actualKeys)}]");
                }

                foreach (var key in expectedKeys.Intersect(actualKeys))
                {
                    Compare($"{path}.{key}", expected.GetProperty(key), actual.GetProperty(key), differences);
                }

                break;
            case JsonValueKind.Array:
                if (expected.GetArrayLength() != actual.GetArrayLength())
                {
                    differences.Add($"{path}: expected {expected.GetArrayLength()} items, got {actual.GetArrayLength()}");
                    break;
                }

                for (var i = 0; i < expected.GetArrayLength(); i++)
                {
                    Compare($"{path}[{i}]", expected[i], actual[i], differences);
                }

                break;
            case JsonValueKind.Number:
                var e = expected.GetDouble();
                var a = actual.GetDouble();
                if (Math.Abs(e - a) > Math.Max(AbsoluteTolerance, RelativeTolerance * Math.Abs(e)))
                {
                    differences.Add(FormattableString.Invariant($"{path}: expected {e}, got {a}"));
                }

                break;
            case JsonValueKind.True or JsonValueKind.False or JsonValueKind.String:
                if (expected.ToString() != actual.ToString())
                {
                    differences.Add($"{path}: expected {expected}, got {actual}");
                }

                break;
        }
    }

    private static bool IsBool(JsonElement e) => e.ValueKind is JsonValueKind.True or JsonValueKind.False;
}
