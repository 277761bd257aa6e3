using System.Globalization;
using System.Text.Json;
using System.Xml;
using System.Xml.Linq;
using System.Xml.Schema;
using DriftWatch.Output;
using MathNet.Numerics.Statistics;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// <c>check --format junit|markdown</c>, <c>--output</c>, <c>--fail-at</c> and <c>--tag</c> end to end in-process, on a
/// real SQLite source and store. The JUnit report is held to an XSD of the common JUnit format (Data/junit/junit.xsd,
/// written from memory) and read back with XDocument; the Markdown report is rendered by Markdig, a CommonMark and
/// GitHub-flavoured Markdown renderer, and its HTML table read back. Figures: MathNet.Numerics as the oracle.
/// </summary>
public sealed class CheckCiReportTests : IDisposable
{
    // A table name a database may well hold that breaks naive XML and Markdown: a pipe, pointy brackets, a backtick,
    // an ampersand and a line break. The query pair reading it fails (no such table), and SQLite's error quotes it.
    private const string HostileTable = "ledger|<`week`> & co\nline two";

    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-ci-" + Guid.NewGuid().ToString("N"));
    private readonly double[] _x;
    private readonly double[] _y;
    private readonly double[] _crates;

    public CheckCiReportTests()
    {
        Directory.CreateDirectory(_folder);
        var random = new Random(20261203);
        _x = [.. Enumerable.Range(0, 300).Select(_ => 10 + (random.NextDouble() * 90))];
        _y = [.. _x.Select(v => (2.5 * v) + 40 + ((random.NextDouble() - 0.5) * 30))];
        _crates = [.. _x.Select(v => (0.4 * v) + 5 + ((random.NextDouble() - 0.5) * 12))];
        using var connection = Open();
        Execute(connection, "CREATE TABLE shifts (crew_hours REAL, pallets REAL, crates REAL)");
        using var transaction = connection.BeginTransaction();
        for (var i = 0; i < _x.Length; i++)
        {
            using var insert = connection.CreateCommand();
            insert.CommandText = "INSERT INTO shifts VALUES ($x, $y, $c)";
            insert.Parameters.AddWithValue("$x", _x[i]);
            insert.Parameters.AddWithValue("$y", _y[i]);
            insert.Parameters.AddWithValue("$c", _crates[i]);
            insert.ExecuteNonQuery();
        }

        transaction.Commit();
        WriteConfig(publicUrl: "https://dw.example.test/base/");
    }

    private string ConfigPath => Path.Combine(_folder, "driftwatch.yaml");

    [Fact]
    public async Task Junit_CriticalFindingHealthyPairAndFailedQuery_ValidatesAndCountsOneFailureOneError()
    {
        await BuildBaselinesAsync();
        CopyPalletsFromHours();

        var run = await CliRun.Of("check", "--config", ConfigPath, "--format", "junit");

        Assert.Equal(3, run.ExitCode);
        var xml = ValidJunit(run.Out);
        var suite = Assert.Single(xml.Root!.Elements("testsuite"));
        Assert.Equal("driftwatch check", (string?)suite.Attribute("name"));
        Assert.Equal(3, (int)suite.Attribute("tests")!);
        Assert.Equal(1, (int)suite.Attribute("failures")!);
        Assert.Equal(1, (int)suite.Attribute("errors")!);
        Assert.Equal(1, suite.Elements("testcase").Count(t => t.Element("failure") is not null));
        Assert.Equal(1, suite.Elements("testcase").Count(t => t.Element("error") is not null));
        Assert.Equal(3, (int)xml.Root.Attribute("tests")!);
        Assert.Equal("driftwatch check", (string?)xml.Root.Attribute("name"));
        Assert.Equal("warning", Property(suite, "driftwatch.fail_at"));
        Assert.Equal("3", Property(suite, "driftwatch.exit_code"));
        Assert.Equal(Cautions.SignalsNotProof, (string?)suite.Element("system-out"));

        // y copied from x after a baseline: became_perfect, critical (as CheckCommandTests pins it).
        var pallets = TestCase(suite, "hours-vs-pallets");
        Assert.Equal("floor.shifts", (string?)pallets.Attribute("classname"));
        var failure = Assert.Single(pallets.Elements("failure"));
        Assert.Equal("became_perfect", (string?)failure.Attribute("type"));
        Assert.StartsWith("critical became_perfect", (string?)failure.Attribute("message"), StringComparison.Ordinal);
        // The key figures: the baseline's mean r over its two runs of the same rows is MathNet's r of those rows; now r is 1.
        Assert.Contains($"r {Figures.Correlation(Correlation.Pearson(_x, _y))} → 1.000", failure.Value, StringComparison.Ordinal);
        Assert.Empty(pallets.Elements("error"));

        var crates = TestCase(suite, "hours-vs-crates");
        Assert.Empty(crates.Elements("failure"));
        Assert.Empty(crates.Elements("error"));
        var crateFigure = Figures.Correlation(Correlation.Pearson(_x, _crates));
        Assert.Contains($"r {crateFigure} → {crateFigure}", (string?)crates.Element("system-out"), StringComparison.Ordinal);

        // The hostile table name survives the round trip through XML exactly: escaping, not stripping.
        var ledger = TestCase(suite, "odd-ledger");
        Assert.Equal("floor.query", (string?)ledger.Attribute("classname"));
        var error = Assert.Single(ledger.Elements("error"));
        Assert.Equal("failed", (string?)error.Attribute("type"));
        Assert.Contains(HostileTable, (string?)error.Attribute("message"), StringComparison.Ordinal);
        Assert.Equal(await RecordedErrorAsync("odd-ledger"), ((string)error.Attribute("message")!)["failed: ".Length..]);
    }

    [Fact]
    public async Task Junit_FailAtCritical_WarningFindingsGoToSystemOutAndTheStepPasses()
    {
        await BuildBaselinesAsync();
        using (var connection = Open())
        {
            // A changed rate: pallets per crew hour up by 70 %, r kept (a factor no unit change gives).
            Execute(connection, "UPDATE shifts SET pallets = pallets * 1.7");
        }

        var run = await CliRun.Of("check", "--config", ConfigPath, "--tag", "floor", "--format", "junit", "--fail-at", "critical");

        var json = await LatestFindingsAsync("hours-vs-pallets");
        Assert.Contains(json, f => f.Severity == "warning");
        Assert.DoesNotContain(json, f => f.Severity == "critical");
        Assert.Equal(0, run.ExitCode);
        var suite = ValidJunit(run.Out).Root!.Element("testsuite")!;
        Assert.Equal(0, (int)suite.Attribute("failures")!);
        Assert.Equal("critical", Property(suite, "driftwatch.fail_at"));
        var pallets = TestCase(suite, "hours-vs-pallets");
        Assert.Empty(pallets.Elements("failure"));
        var output = (string?)pallets.Element("system-out");
        foreach (var finding in json)
        {
            Assert.Contains($"{finding.Severity} {finding.Kind}", output, StringComparison.Ordinal);
            Assert.Contains(finding.Message, output, StringComparison.Ordinal);
        }
    }

    [Fact]
    public async Task Check_FailAtWarningAgainstCritical_DecidesTheExitCodeOfAWarningOnlyRun()
    {
        await BuildBaselinesAsync();
        using (var connection = Open())
        {
            Execute(connection, "UPDATE shifts SET pallets = pallets * 1.7");
        }

        var atWarning = await CliRun.Of("check", "--config", ConfigPath, "--pair", "hours-vs-pallets", "--format", "json");
        var atCritical = await CliRun.Of("check", "--config", ConfigPath, "--pair", "hours-vs-pallets", "--format", "json", "--fail-at", "critical");

        Assert.Equal(1, atWarning.ExitCode);
        Assert.Equal(0, atCritical.ExitCode);
        using var report = JsonDocument.Parse(atCritical.Out);
        Assert.Equal(0, report.RootElement.GetProperty("exit_code").GetInt32());
        Assert.Contains(report.RootElement.GetProperty("pairs")[0].GetProperty("findings").EnumerateArray(), f => f.GetProperty("severity").GetString() == "warning");
    }

    [Fact]
    public async Task Markdown_RenderedByMarkdig_GivesOneRowPerPairWithLinksFiguresAndTheHostileErrorIntact()
    {
        await BuildBaselinesAsync();
        CopyPalletsFromHours();

        var run = await CliRun.Of("check", "--config", ConfigPath, "--format", "markdown");

        Assert.Equal(3, run.ExitCode);
        var html = MarkdownHtml.Render(run.Out);
        Assert.Equal("DriftWatch check", MarkdownHtml.Text(html.Descendants("h2").Single()));
        var table = html.Descendants("table").Single();
        Assert.Equal(["pair", "status", "r baseline → now", "findings"], table.Descendants("th").Select(MarkdownHtml.Text));
        var rows = table.Element("tbody")!.Elements("tr").Select(tr => tr.Elements("td").ToArray()).ToDictionary(c => MarkdownHtml.Text(c[0]));
        Assert.Equal(["hours-vs-pallets", "hours-vs-crates", "odd-ledger"], rows.Keys);

        var pallets = rows["hours-vs-pallets"];
        Assert.Equal("https://dw.example.test/base/pairs/hours-vs-pallets", (string?)pallets[0].Element("a")!.Attribute("href"));
        Assert.Equal("succeeded, failing", MarkdownHtml.Text(pallets[1]));
        Assert.Equal($"{Figures.Correlation(Correlation.Pearson(_x, _y))} → 1.000", MarkdownHtml.Text(pallets[2]));
        Assert.StartsWith("critical became_perfect", MarkdownHtml.Text(pallets[3]), StringComparison.Ordinal);

        var crates = rows["hours-vs-crates"];
        Assert.Equal("succeeded, passing", MarkdownHtml.Text(crates[1]));
        Assert.Equal("none", MarkdownHtml.Text(crates[3]));

        // The recorded error, line break and all, is the cell's text: nothing escaped shows, nothing broke the row.
        var ledger = rows["odd-ledger"];
        Assert.Equal("failed", MarkdownHtml.Text(ledger[1]));
        Assert.Equal((await RecordedErrorAsync("odd-ledger")).ReplaceLineEndings("\n"), MarkdownHtml.Text(ledger[3]));
        Assert.Empty(html.Descendants("code"));

        var totals = MarkdownHtml.Text(html.Elements("p").First());
        Assert.StartsWith("3 pairs checked at ", totals, StringComparison.Ordinal);
        Assert.EndsWith("1 passing, 1 failing (a finding at warning or worse), 1 not measured. Exit code 3.", totals, StringComparison.Ordinal);
        Assert.Contains(Cautions.SignalsNotProof, MarkdownHtml.Text(html.Descendants("blockquote").Single()), StringComparison.Ordinal);
        Assert.Contains("sampled data values", MarkdownHtml.Text(html.Descendants("blockquote").Single()), StringComparison.Ordinal);
    }

    [Fact]
    public async Task Markdown_WithoutPublicUrl_HasNoLinksAndNoPlotCaution()
    {
        WriteConfig(publicUrl: null);

        var run = await CliRun.Of("check", "--config", ConfigPath, "--tag", "floor", "--format", "markdown");

        Assert.Equal(0, run.ExitCode);
        var html = MarkdownHtml.Render(run.Out);
        Assert.Empty(html.Descendants("a"));
        Assert.Equal(2, html.Descendants("tbody").Single().Elements("tr").Count());
        Assert.Equal(Cautions.SignalsNotProof, MarkdownHtml.Text(html.Descendants("blockquote").Single()));
    }

    [Fact]
    public async Task Output_JunitToAFile_ReplacesTheFileWholeAndLeavesStandardOutputEmpty()
    {
        var reports = Directory.CreateDirectory(Path.Combine(_folder, "reports"));
        var file = Path.Combine(reports.FullName, "driftwatch.xml");
        File.WriteAllText(file, "an older report, longer than nothing");

        var run = await CliRun.Of("check", "--config", ConfigPath, "--tag", "floor", "--format", "junit", "--output", file);

        Assert.Equal(0, run.ExitCode);
        Assert.Equal(string.Empty, run.Out);
        Assert.Contains($"Wrote the JUnit XML report to {file}: 2 pair(s), 2 passing, 0 failing, 0 not measured.", run.Error, StringComparison.Ordinal);
        var suite = ValidJunit(File.ReadAllText(file)).Root!.Element("testsuite")!;
        Assert.Equal(2, (int)suite.Attribute("tests")!);
        Assert.Equal([file], Directory.GetFiles(reports.FullName));
    }

    [Fact]
    public async Task Output_FolderMissing_ExitsTwoBeforeAnyCheck()
    {
        var file = Path.Combine(_folder, "no-such-folder", "driftwatch.md");

        var run = await CliRun.Of("check", "--config", ConfigPath, "--format", "markdown", "--output", file);

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("no-such-folder does not exist", run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("Checking", run.Error, StringComparison.Ordinal);
        var history = await CliRun.Of("history", "hours-vs-pallets", "--config", ConfigPath, "--format", "json");
        using var runs = JsonDocument.Parse(history.Out);
        Assert.Equal(0, runs.RootElement.GetProperty("runs").GetArrayLength());
    }

    [Fact]
    public async Task Tag_TwoTagsAndAPair_ChecksTheUnionInConfigurationOrder()
    {
        var billing = await CliRun.Of("check", "--config", ConfigPath, "--tag", "billing", "--format", "json");
        var union = await CliRun.Of("check", "--config", ConfigPath, "-t", "billing", "--tag", "ledger", "--pair", "hours-vs-pallets", "--format", "json");

        Assert.Equal(["hours-vs-crates"], PairNames(billing.Out));
        Assert.Equal(0, billing.ExitCode);
        Assert.Equal(["hours-vs-pallets", "hours-vs-crates", "odd-ledger"], PairNames(union.Out));
        Assert.Equal(3, union.ExitCode);
    }

    [Fact]
    public async Task Tag_Unknown_ExitsTwoWithAHintAndTheKnownTags()
    {
        var run = await CliRun.Of("check", "--config", ConfigPath, "--tag", "flor");

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("no pair carries the tag 'flor'", run.Error, StringComparison.Ordinal);
        Assert.Contains("(did you mean 'floor'?)", run.Error, StringComparison.Ordinal);
        Assert.Contains("known tags: billing, floor, ledger", run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("Checking", run.Error, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("--format", "xml", "--format must be 'table', 'json', 'junit' or 'markdown', was 'xml'")]
    [InlineData("--fail-at", "info", "--fail-at must be 'warning' or 'critical', was 'info'")]
    public async Task Options_UnknownWord_ExitTwoListingTheWords(string option, string value, string message)
    {
        var run = await CliRun.Of("check", "--config", ConfigPath, option, value);

        Assert.Equal(2, run.ExitCode);
        Assert.Contains(message, run.Error + run.Out, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Help_NamesTheNewOptionsAndAnExample()
    {
        var run = await CliRun.Of("check", "--help");

        Assert.Equal(0, run.ExitCode);
        Assert.Contains("table|json|junit|markdown", run.Out, StringComparison.Ordinal);
        Assert.Contains("--fail-at <warning|critical>", run.Out, StringComparison.Ordinal);
        Assert.DoesNotContain("[default: Warning]", run.Out, StringComparison.Ordinal);
        Assert.Contains("--tag", run.Out, StringComparison.Ordinal);
        Assert.Contains("--output <FILE>", run.Out, StringComparison.Ordinal);
        Assert.Contains("driftwatch check --tag billing --format junit --output reports/driftwatch.xml", run.Out, StringComparison.Ordinal);
    }

    private async Task BuildBaselinesAsync()
    {
        // baseline.first_runs is 2: two healthy runs of the pairs on the table.
        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath, "--tag", "floor")).ExitCode);
        Assert.Equal(0, (await CliRun.Of("check", "--config", ConfigPath, "--tag", "floor")).ExitCode);
    }

    private void CopyPalletsFromHours()
    {
        using var connection = Open();
        Execute(connection, "UPDATE shifts SET pallets = crew_hours");
    }

    private async Task<string> RecordedErrorAsync(string pair)
    {
        var history = await CliRun.Of("history", pair, "--config", ConfigPath, "--format", "json");
        using var runs = JsonDocument.Parse(history.Out);
        return runs.RootElement.GetProperty("runs")[0].GetProperty("error").GetString()!;
    }

    private async Task<IReadOnlyList<(string Severity, string Kind, string Message)>> LatestFindingsAsync(string pair)
    {
        var history = await CliRun.Of("history", pair, "--config", ConfigPath, "--format", "json");
        using var runs = JsonDocument.Parse(history.Out);
        return [.. runs.RootElement.GetProperty("runs")[0].GetProperty("findings").EnumerateArray().Select(f => (
            f.GetProperty("severity").GetString()!, f.GetProperty("kind").GetString()!, f.GetProperty("message").GetString()!))];
    }

    private static string[] PairNames(string json)
    {
        using var report = JsonDocument.Parse(json);
        return [.. report.RootElement.GetProperty("pairs").EnumerateArray().Select(p => p.GetProperty("pair").GetString()!)];
    }

    /// <summary>Parses the report and validates it against the JUnit schema; any schema error fails the test.</summary>
    internal static XDocument ValidJunit(string text)
    {
        var schemas = new XmlSchemaSet();
        schemas.Add(null, TestData.Path("junit", "junit.xsd"));
        var document = XDocument.Parse(text);
        var errors = new List<string>();
        document.Validate(schemas, (_, e) => errors.Add($"{e.Severity}: {e.Message}"));
        Assert.Empty(errors);
        return document;
    }

    private static XElement TestCase(XElement suite, string name) =>
        Assert.Single(suite.Elements("testcase"), t => (string?)t.Attribute("name") == name);

    private static string? Property(XElement suite, string name) =>
        (string?)suite.Element("properties")!.Elements("property").Single(p => (string?)p.Attribute("name") == name).Attribute("value");

    private void WriteConfig(string? publicUrl)
    {
        var alerting = publicUrl is null ? string.Empty : $"alerting:\n  public_url: {publicUrl}\n";
        var table = HostileTable.Replace("\n", "\\n", StringComparison.Ordinal);
        File.WriteAllText(ConfigPath, string.Create(CultureInfo.InvariantCulture, $"""
            sources:
              - name: floor
                kind: sqlite
                connection: floor.db
            store:
              connection: store.db
            {alerting}pairs:
              - name: hours-vs-pallets
                source: floor
                table: shifts
                x: crew_hours
                y: pallets
                sample:
                  method: all
                baseline:
                  first_runs: 2
                tags: [floor]
              - name: hours-vs-crates
                source: floor
                table: shifts
                x: crew_hours
                y: crates
                sample:
                  method: all
                baseline:
                  first_runs: 2
                tags: [floor, billing]
              - name: odd-ledger
                source: floor
                query: "SELECT crew_hours, pallets FROM \"{table}\""
                x: crew_hours
                y: pallets
                tags: [ledger]
            """));
    }

    private SqliteConnection Open()
    {
        var connection = new SqliteConnection($"Data Source={Path.Combine(_folder, "floor.db")};Pooling=False");
        connection.Open();
        return connection;
    }

    private static void Execute(SqliteConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        command.ExecuteNonQuery();
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(_folder, recursive: true);
    }
}
