using System.CommandLine;
using System.Text.Json;
using DriftWatch.Cli;
using DriftWatch.Output;

namespace DriftWatch.Tests.Cli;

public sealed class ProfileCommandTests
{
    private static readonly string Set1 = TestData.Path("anscombe_set1.csv");
    private static readonly string Set1InKg = TestData.Path("anscombe_set1_x_in_kg.csv");

    private static JsonElement Json(CliRun run) => JsonDocument.Parse(run.Out).RootElement.Clone();

    private static string TempCsv(string content)
    {
        var path = Path.Combine(Path.GetTempPath(), "driftwatch-test-" + Guid.NewGuid().ToString("N") + ".csv");
        File.WriteAllText(path, content);
        return path;
    }

    [Fact]
    public async Task Profile_AnscombeSet1Json_PublishedFiguresAndHealthy()
    {
        var run = await CliRun.Of("profile", "--csv", Set1, "--x", "x", "--y", "y", "--format", "json");

        var current = Json(run).GetProperty("current");
        // Anscombe (1973): r = 0.816 (3 dp), y = 3.00 + 0.500x, mean x = 9, mean y = 7.50 (2 dp).
        Assert.Equal(0.816, current.GetProperty("pearson_r").GetDouble(), 0.0005);
        Assert.Equal(3.00, current.GetProperty("intercept").GetDouble(), 0.005);
        Assert.Equal(0.500, current.GetProperty("slope").GetDouble(), 0.0005);
        Assert.Equal(9, current.GetProperty("x_mean").GetDouble(), 1e-12);
        Assert.Equal(7.50, current.GetProperty("y_mean").GetDouble(), 0.005);
        Assert.Equal(11, current.GetProperty("n_used").GetInt32());
        Assert.Equal(JsonValueKind.Null, Json(run).GetProperty("baseline").ValueKind);
        // Set 1 is the quartet's well-behaved linear cloud: nothing at warning or worse, exit 0.
        Assert.Equal("linear", current.GetProperty("shape").GetString());
        Assert.DoesNotContain(Json(run).GetProperty("findings").EnumerateArray(), f => f.GetProperty("severity").GetString() is "warning" or "critical");
        Assert.Equal(ExitCodes.Healthy, run.ExitCode);
    }

    [Fact]
    public async Task Profile_BaselineSet1CurrentExactPoundsToKilograms_BecamePerfectExit1()
    {
        // Current y = x × 0.45359237, the exact pound-to-kilogram factor (NIST SP 811, Appendix B).
        var run = await CliRun.Of("profile", "--csv", Set1InKg, "--x", "x", "--y", "y", "--baseline-csv", Set1, "--format", "json");

        var json = Json(run);
        Assert.Equal(ExitCodes.Findings, run.ExitCode);
        var perfect = Assert.Single(json.GetProperty("findings").EnumerateArray(), f => f.GetProperty("kind").GetString() == "became_perfect");
        Assert.Contains(perfect.GetProperty("severity").GetString(), new[] { "warning", "critical" });
        Assert.True(json.GetProperty("current").GetProperty("exact_affine").GetBoolean());
        Assert.Equal(0.45359237, json.GetProperty("current").GetProperty("slope").GetDouble(), 1e-12);
        Assert.False(json.GetProperty("baseline").GetProperty("exact_affine").GetBoolean());
        Assert.Equal(0.816, json.GetProperty("baseline").GetProperty("pearson_r").GetDouble(), 0.0005);
    }

    [Fact]
    public async Task Profile_DeclaredExactOnAnscombeSet1_ExactnessLostExit1()
    {
        // Anscombe (1973): set 1 has r = 0.816, far from an exact function, so a pair declared exact has lost it.
        var run = await CliRun.Of("profile", "--csv", Set1, "--x", "x", "--y", "y", "--declared-exact", "--format", "json");

        Assert.Equal(ExitCodes.Findings, run.ExitCode);
        var lost = Assert.Single(Json(run).GetProperty("findings").EnumerateArray(), f => f.GetProperty("kind").GetString() == "exactness_lost");
        Assert.Equal("critical", lost.GetProperty("severity").GetString());
    }

    [Fact]
    public async Task Profile_DeclaredExactOnExactPoundsToKilograms_ExactnessIsHealthy()
    {
        // Current y = x × 0.45359237 exactly (NIST SP 811, Appendix B): declared exact, it raises no exactness finding.
        var run = await CliRun.Of("profile", "--csv", Set1InKg, "--x", "x", "--y", "y", "--baseline-csv", Set1, "--declared-exact", "--format", "json");

        var kinds = Json(run).GetProperty("findings").EnumerateArray().Select(f => f.GetProperty("kind").GetString()).ToList();
        Assert.True(Json(run).GetProperty("current").GetProperty("exact_affine").GetBoolean());
        Assert.DoesNotContain("became_perfect", kinds);
        Assert.DoesNotContain("perfect_relationship", kinds);
        Assert.DoesNotContain("exactness_lost", kinds);
    }

    [Fact]
    public async Task Profile_FormerExpectExactOption_IsRefused()
    {
        var run = await CliRun.Of("profile", "--csv", Set1, "--x", "x", "--y", "y", "--expect-exact");

        Assert.Equal(ExitCodes.UsageError, run.ExitCode);
        Assert.Contains("--expect-exact", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Profile_BaselineColumnsNamedDifferently_UsesBaselineNames()
    {
        var baseline = TempCsv("pounds,kilos_measured\n" + string.Join('\n', File.ReadAllLines(Set1).Skip(1)) + "\n");
        try
        {
            var run = await CliRun.Of("profile", "--csv", Set1InKg, "--x", "x", "--y", "y", "--baseline-csv", baseline,
                "--baseline-x", "pounds", "--baseline-y", "kilos_measured", "--format", "json");

            Assert.Equal(0.816, Json(run).GetProperty("baseline").GetProperty("pearson_r").GetDouble(), 0.0005);
        }
        finally
        {
            File.Delete(baseline);
        }
    }

    [Fact]
    public async Task Profile_MissingFile_Exit2NamingFile()
    {
        var run = await CliRun.Of("profile", "--csv", "no_such_orders.csv", "--x", "a", "--y", "b");

        Assert.Equal(ExitCodes.UsageError, run.ExitCode);
        Assert.Equal("error: file not found: no_such_orders.csv", run.Error.Trim());
        Assert.Empty(run.Out);
    }

    [Fact]
    public async Task Profile_MissingColumn_Exit2ListingColumns()
    {
        var run = await CliRun.Of("profile", "--csv", Set1, "--x", "x", "--y", "spend");

        Assert.Equal(ExitCodes.UsageError, run.ExitCode);
        Assert.Equal($"error: column 'spend' not found in {Set1} (columns: x, y)", run.Error.Trim());
    }

    [Fact]
    public async Task Profile_TextCells_WarnedWithLineAndCounted()
    {
        var path = TestData.Path("csv", "text_cells.csv");

        var run = await CliRun.Of("profile", "--csv", path, "--x", "x", "--y", "y", "--format", "json");

        Assert.Contains($"warning: {path}:5: column 'y' value 'abc' is not a number (2 such cells)", run.Error, StringComparison.Ordinal);
        Assert.Contains($"warning: {path}:6: column 'x' value 'n/a' is not a number (1 such cell)", run.Error, StringComparison.Ordinal);
        var current = Json(run).GetProperty("current");
        Assert.Equal(3, current.GetProperty("n_non_numeric").GetInt32());
        Assert.Equal(3, current.GetProperty("n_used").GetInt32());
        Assert.Equal(6, current.GetProperty("n_rows").GetInt32());
    }

    [Fact]
    public async Task Profile_NonFiniteCellsAndConstantColumn_JsonHasNullsNeverNaN()
    {
        // y is constant on the usable rows: correlation and fit are undefined (zero variance; common practice).
        var path = TempCsv("x,y\n1,5\n2,5\n3,5\n4,5\nNaN,5\n6,Infinity\n7,-Infinity\n");
        try
        {
            var run = await CliRun.Of("profile", "--csv", path, "--x", "x", "--y", "y", "--format", "json");

            Assert.DoesNotContain("NaN", run.Out, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("Infinity", run.Out, StringComparison.OrdinalIgnoreCase);
            var current = Json(run).GetProperty("current");
            Assert.Equal(3, current.GetProperty("n_nonfinite").GetInt32());
            Assert.Equal(JsonValueKind.Null, current.GetProperty("pearson_r").ValueKind);
            Assert.Equal(JsonValueKind.Null, current.GetProperty("spearman_rho").ValueKind);
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public async Task Profile_NoCsv_RunsBundledSampleAndSaysSo()
    {
        var run = await CliRun.Of("profile", "--format", "json");

        Assert.Contains("bundled sample", Assert.Single(run.Error.Split('\n', StringSplitOptions.RemoveEmptyEntries)), StringComparison.Ordinal);
        var json = Json(run);
        // The current extract is built as loaves_baked = 118 × oven_hours (see Samples/); the baseline is counted.
        Assert.True(json.GetProperty("current").GetProperty("exact_affine").GetBoolean());
        Assert.Equal(BundledSample.CurrentLoavesPerHour, json.GetProperty("current").GetProperty("slope").GetDouble(), 1e-9);
        Assert.Equal(1, json.GetProperty("current").GetProperty("n_null").GetInt32());
        Assert.False(json.GetProperty("baseline").GetProperty("exact_affine").GetBoolean());
        Assert.Contains(json.GetProperty("findings").EnumerateArray(), f => f.GetProperty("kind").GetString() == "became_perfect");
        Assert.Equal(ExitCodes.Findings, run.ExitCode);
    }

    [Fact]
    public async Task Profile_NoArgumentsTable_PlainReportWithFindingAndCaution()
    {
        var run = await CliRun.Of("profile");

        Assert.Equal(ExitCodes.Findings, run.ExitCode);
        Assert.DoesNotContain('\u001b', run.Out);
        Assert.Contains("became_perfect", run.Out, StringComparison.Ordinal);
        Assert.Contains("baseline: bakery_baseline.csv", run.Out, StringComparison.Ordinal);
        Assert.Contains("Findings are statistical signals, not proof.", run.Out, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Profile_AnscombeSet1Table_ShowsRoundedCorrelation()
    {
        var run = await CliRun.Of("profile", "--csv", Set1, "--x", "x", "--y", "y");

        // r = 0.816 (Anscombe 1973) shown to four significant digits.
        var line = Assert.Single(run.Out.Split('\n'), l => l.Contains("Pearson r [CI]", StringComparison.Ordinal));
        Assert.Contains("0.816", line, StringComparison.Ordinal);
        Assert.Contains("No findings.", run.Out, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("profile", "--csv", "a.csv")]
    [InlineData("profile", "--x", "a")]
    [InlineData("profile", "--alpha", "1.5")]
    [InlineData("profile", "--outlier-t", "abc")]
    [InlineData("profile", "--format", "xml")]
    [InlineData("profile", "--no-such-option")]
    [InlineData("no-such-command")]
    public async Task Profile_BadCommandLine_Exit2WithErrorLine(params string[] args)
    {
        var run = await CliRun.Of(args);

        Assert.Equal(ExitCodes.UsageError, run.ExitCode);
        Assert.StartsWith("error: ", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Profile_Help_DescribesEveryOption()
    {
        var command = ProfileCommand.Create(CliConsole.ForWriters(TextWriter.Null, TextWriter.Null));
        var run = await CliRun.Of("profile", "--help");

        Assert.Equal(ExitCodes.Healthy, run.ExitCode);
        Assert.Contains("Example:", run.Out, StringComparison.Ordinal);
        foreach (var option in command.Options.Where(o => o.Name != "--help"))
        {
            Assert.False(string.IsNullOrWhiteSpace(option.Description), option.Name);
            Assert.Contains(run.Out.Split('\n'), l => l.TrimStart().StartsWith(option.Name + " ", StringComparison.Ordinal) && l.Contains(option.Description!, StringComparison.Ordinal));
        }
    }
}
