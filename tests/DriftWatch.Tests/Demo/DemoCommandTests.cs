using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Demo;
using DriftWatch.Tests.Cli;
using DriftWatch.Tests.Configuration;

namespace DriftWatch.Tests.Demo;

/// <summary>
/// The demo end to end, in-process, into a temporary folder. A scenario test on invented data (allowed for the
/// demo only; the engine's figures are tested against published data elsewhere). Allowed lag: a fault must show
/// its expected finding on its day or within 2 days after it, the expected alert must have been confirmed in that span,
/// and the control pair must carry no finding at all on any of the 21 days.
/// </summary>
public sealed class DemoCommandTests : IClassFixture<DemoCommandTests.FullDemo>
{
    private const int AllowedLag = 2;
    private readonly FullDemo _demo;

    public DemoCommandTests(FullDemo demo) => _demo = demo;

    public static TheoryData<string, int, FindingKind> StatisticalFaults => new()
    {
        { "declared-vs-weighed", 8, FindingKind.BecamePerfect },
        { "truck-km-vs-fuel", 11, FindingKind.SlopeShift },
        { "vessel-teu-vs-discharged", 13, FindingKind.RelationshipLost },
        { "reefer-count-vs-power", 15, FindingKind.OutlierSurge },
        { "yard-occupancy-vs-gate-wait", 17, FindingKind.CurvatureAppeared },
    };

    [Fact]
    public void Demo_TwentyOneDays_ExitsZeroAndPrintsOneLinePerDayAndTheSummary()
    {
        Assert.Equal(0, _demo.Run.ExitCode);
        for (var day = 1; day <= 21; day++)
        {
            Assert.Contains($"day {day:00}  2026-11-{day:00}  6 pairs checked", _demo.Run.Out, StringComparison.Ordinal);
        }

        Assert.Contains("day 08  2026-11-08  6 pairs checked  1 new finding: declared-vs-weighed became_perfect (critical)", _demo.Run.Out, StringComparison.Ordinal);
        Assert.Contains("PASS:", _demo.Run.Out, StringComparison.Ordinal);
        Assert.Contains("Control pair crane-hours-vs-moves: 0 false alarms", _demo.Run.Out, StringComparison.Ordinal);
    }

    [Theory]
    [MemberData(nameof(StatisticalFaults))]
    public void Demo_InjectedFault_IsFoundWithinTwoDaysAndAlerted(string pair, int day, FindingKind expected)
    {
        var runs = _demo.Store.Runs[pair];

        // Nothing of the kind before the fault: the finding is about the fault, not a standing condition.
        Assert.DoesNotContain(runs.Where(r => DemoStoreReader.DayOf(r.StartedAt) < day), r => r.Findings.Any(f => f.Kind == expected));
        var first = runs.First(r => r.Findings.Any(f => f.Kind == expected));
        Assert.InRange(DemoStoreReader.DayOf(first.StartedAt), day, day + AllowedLag);
        var confirmed = Assert.Single(_demo.Store.Alerts, a => a.Pair == pair && a.Kind == expected && a.ConfirmedAt is not null);
        Assert.InRange(DemoStoreReader.DayOf(confirmed.ConfirmedAt!.Value), day, day + AllowedLag);
    }

    [Fact]
    public void Demo_ControlPair_HasNoFindingOnAnyDay()
    {
        var runs = _demo.Store.Runs[TerminalScenario.Control.Name];

        Assert.Equal(21, runs.Count);
        Assert.All(runs, r => Assert.Equal(RunStatus.Succeeded, r.Status));
        Assert.All(runs, r => Assert.Empty(r.Findings));
        Assert.DoesNotContain(_demo.Store.Alerts, a => a.Pair == TerminalScenario.Control.Name);
    }

    [Fact]
    public void Demo_MilesInsteadOfKilometres_SlopeShiftIsCriticalAndNamesTheUnitFactor()
    {
        var run = _demo.Store.On("truck-km-vs-fuel", 11);

        var finding = Assert.Single(run.Findings, f => f.Kind == FindingKind.SlopeShift);
        Assert.Equal(Severity.Critical, finding.Severity);

        // 1 mile = 1.609344 km exactly (NIST SP 811, appendix B); the slope per recorded unit grows by it.
        Assert.Equal(1.609344, finding.Effect!.Value, 0.02);
        Assert.Contains("1.609344 (miles and kilometres)", finding.Message, StringComparison.Ordinal);
        Assert.InRange(run.Profile!.PearsonR!.Value - _demo.Store.On("truck-km-vs-fuel", 10).Profile!.PearsonR!.Value, -0.01, 0.01);
    }

    [Fact]
    public void Demo_CopiedColumn_IsBecamePerfectCritical()
    {
        var finding = Assert.Single(_demo.Store.On("declared-vs-weighed", 8).Findings, f => f.Kind == FindingKind.BecamePerfect);

        Assert.Equal(Severity.Critical, finding.Severity);
        Assert.Contains("exact copy of declared_weight_kg", finding.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Demo_RenamedTable_FailsFromDay19AndRaisesCheckFailingOnTheThirdFailure()
    {
        for (var day = 15; day <= 18; day++)
        {
            Assert.Equal(RunStatus.Succeeded, _demo.Store.On("reefer-count-vs-power", day).Status);
        }

        for (var day = 19; day <= 21; day++)
        {
            var run = _demo.Store.On("reefer-count-vs-power", day);
            Assert.Equal(RunStatus.Failed, run.Status);
            Assert.Contains("no table or view reefer_readings", run.Error, StringComparison.Ordinal);
        }

        var alert = Assert.Single(_demo.Store.Alerts, a => a.Pair == "reefer-count-vs-power" && a.Kind == FindingKind.CheckFailing);
        Assert.Equal(Severity.Critical, alert.Severity);
        Assert.Equal(21, DemoStoreReader.DayOf(alert.ConfirmedAt!.Value));
    }

    [Fact]
    public void Demo_AlertMails_AreWrittenAsEmlFilesNamingTheFaults()
    {
        var mails = Directory.GetFiles(Path.Combine(_demo.Folder.Path, DemoFolder.MailFolder), "*.eml");

        Assert.NotEmpty(mails);
        var texts = mails.Select(File.ReadAllText).ToArray();
        Assert.All(texts, t => Assert.StartsWith("From:", t.TrimStart(), StringComparison.Ordinal));
        Assert.Contains(texts, t => t.Contains("declared-vs-weighed", StringComparison.Ordinal));
        Assert.Contains(texts, t => t.Contains("reefer-count-vs-power", StringComparison.Ordinal));
        Assert.DoesNotContain(texts, t => t.Contains("crane-hours-vs-moves", StringComparison.Ordinal));
    }

    [Fact]
    public void Demo_StaticReport_IsWrittenWithEveryPairsPage()
    {
        var report = Path.Combine(_demo.Folder.Path, DemoFolder.ReportFolder);
        var index = File.ReadAllText(Path.Combine(report, "index.html"));

        Assert.Contains("static report   " + Path.Combine(report, "index.html"), _demo.Run.Out, StringComparison.Ordinal);
        Assert.All(TerminalScenario.Pairs, p =>
        {
            Assert.Contains(p.Name, index, StringComparison.Ordinal);
            Assert.True(File.Exists(Path.Combine(report, "pairs", p.Name + ".html")), p.Name);
        });
        Assert.Contains("2026-11-21 23:30 UTC", index, StringComparison.Ordinal);
    }

    [Fact]
    public void Demo_WrittenConfiguration_LoadsThroughTheLoaderWithSixDailyPairs()
    {
        var result = ConfigLoader.Load(Path.Combine(_demo.Folder.Path, DemoFolder.ConfigFile), _ => null);

        Assert.True(result.Ok, string.Join("; ", result.Errors));
        Assert.Equal(6, result.Config!.Pairs.Count);
        Assert.All(result.Config.Pairs, p => Assert.Equal(TimeSpan.FromHours(24), p.Window!.Last));
        Assert.All(result.Config.Pairs, p => Assert.Equal(5, p.Baseline.FirstRuns));
        Assert.Equal(SourceKind.Sqlite, Assert.Single(result.Config.Sources).Kind);
        Assert.Equal(ChannelKind.File, Assert.Single(result.Config.Alerting.MailingLists).Channel);
    }

    /// <summary>One full 21-day demo shared by the assertions above (it takes a few seconds).</summary>
    public sealed class FullDemo : IAsyncLifetime
    {
        internal TempDirectory Folder { get; } = new();

        internal CliRun Run { get; private set; } = null!;

        internal DemoStoreReader Store { get; private set; } = null!;

        public async Task InitializeAsync()
        {
            Run = await CliRun.Of("demo", "--out", Folder.Path);
            Store = await DemoStoreReader.ReadAsync(Folder.Path);
        }

        public Task DisposeAsync()
        {
            Folder.Dispose();
            return Task.CompletedTask;
        }
    }
}
