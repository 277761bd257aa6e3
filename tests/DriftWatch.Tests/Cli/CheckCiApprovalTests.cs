using DriftWatch.Cli;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.Monitoring;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// Pins the JUnit XML and the Markdown of <c>check</c> (outward contracts a CI server and a job page read) against the
/// approved files Data/expected/check_ci.junit.xml and check_ci.md, byte for byte. The input is fixed: three pairs
/// with fixed times, one measured on Anscombe's quartet set I (Anscombe 1973, values from memory: r 0.816, slope 0.500),
/// one failed with an error holding characters XML and Markdown tables must escape, one without a baseline.
/// To approve a deliberate change, copy the received file the failing test names over the approved one and review the diff.
/// </summary>
public sealed class CheckCiApprovalTests
{
    private static readonly DateTimeOffset Start = new(2026, 11, 30, 6, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Junit_FixedPass_MatchesTheApprovedFileAndTheSchema()
    {
        var received = CheckJunit.Write(Tally());

        CheckCiReportTests.ValidJunit(received);
        Approve("check_ci.junit.xml", received);
    }

    [Fact]
    public void Markdown_FixedPass_MatchesTheApprovedFile()
    {
        var received = CheckMarkdown.Write(Tally(), new Uri("https://dw.example.test/"));

        Approve("check_ci.md", received);
    }

    [Fact]
    public void AnscombeProfile_HasThePublishedFigures()
    {
        // The approved files show r 0.816 and slope 0.5001: Anscombe (1973) gives r = 0.816, y = 3.00 + 0.500x.
        var profile = Anscombe();

        Assert.Equal(0.816, profile.PearsonR!.Value, 0.0005);
        Assert.Equal(0.500, profile.Slope!.Value, 0.0005);
    }

    private static CheckTally Tally()
    {
        var profile = Anscombe();
        var baseline = new BaselineSummary(Start.AddDays(-7), Start.AddDays(-7), Start.AddDays(-1), 5, false, 0.95, 0.25, 3.0, 0.4, 11, 0);
        var weights = new PairCheckResult(
            Pair("ship-weight", "manifests", ["yard"]), 41, RunStatus.Succeeded, null, profile,
            [
                new Finding(FindingKind.MarginalShift, Severity.Info, 0.02, 0.3, "The distribution of weighed_kg shifted."),
                new Finding(FindingKind.SlopeShift, Severity.Critical, 0.0004, 2.0, "The slope changed by a factor of 2 | see `weighed_kg` <kg> & co."),
            ],
            Start, Start.AddSeconds(1.25), HasBaseline: true) { JudgedAgainst = baseline };
        var cranes = new PairCheckResult(
            Pair("crane-moves", null, ["yard", "cranes"]), 42, RunStatus.Failed, "no such table: moves|<week>\nsecond line \u0001.",
            null, [], Start.AddSeconds(0.5), Start.AddSeconds(0.75), HasBaseline: false);
        var reefers = new PairCheckResult(
            Pair("reefer-power", "reefers", []), 43, RunStatus.Succeeded, null, profile, [], Start.AddSeconds(0.25), Start.AddSeconds(2), HasBaseline: false);
        IReadOnlyList<PairCheckResult> results = [weights, cranes, reefers];
        return new CheckTally(results, Severity.Warning, CheckCommand.ExitCodeOf(results));
    }

    private static RelationshipProfile Anscombe() => Profiler.Profile(
        new PairedSample([10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5], [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68]),
        Thresholds.Default);

    private static PairConfig Pair(string name, string? table, IReadOnlyList<string> tags) => new()
    {
        Name = name,
        Source = "yard-db",
        Table = table,
        Query = table is null ? "SELECT hours, moves FROM moves" : null,
        X = "declared_kg",
        Y = "weighed_kg",
        Tags = tags,
    };

    private static void Approve(string name, string received)
    {
        var approved = File.ReadAllText(TestData.Path("expected", name));
        if (approved != received)
        {
            var path = Path.Combine(Path.GetTempPath(), "received." + name);
            File.WriteAllText(path, received);
            Assert.Fail($"{name} differs from the approved file; received: {path}");
        }
    }
}
