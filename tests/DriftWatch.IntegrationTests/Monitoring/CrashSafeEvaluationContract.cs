using Dapper;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Store;
using Microsoft.Extensions.Time.Testing;
using static DriftWatch.IntegrationTests.Monitoring.EvaluationHarness;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>
/// Alert evaluation survives a crash at every write of its commit: afterwards no run is judged twice (a warning
/// that needs two runs in a row is not confirmed after one), none is skipped, and no mail is queued twice or lost.
/// One unreadable run does not stop the other pairs. Run against each real database engine (subclasses pick one).
/// </summary>
public abstract class CrashSafeEvaluationContract : IDisposable
{
    private readonly string _mailFolder = Directory.CreateTempSubdirectory("dw-crash-").FullName;

    /// <summary>A freshly migrated, empty store; each call in one test gives a new handle on the same database.</summary>
    private protected abstract Task<IStoreDatabase> DatabaseAsync();

    [Theory]
    // The cycle's transaction writes the alert states, then the outbox rows, then the watermark.
    [InlineData("alerts")]
    [InlineData("outbox")]
    [InlineData("worker_state")]
    public async Task Evaluate_CrashAtAWriteOfTheCommit_RestartJudgesEachRunOnce(string crashAt)
    {
        var config = Config(_mailFolder, "parcels");
        var time = new FakeTimeProvider(Start);
        var before = new EvaluationHarness(await DatabaseAsync(), config, time);
        var run1 = await before.RecordAsync("parcels", Warning("slope moved from 0.50 to 0.90"), Critical("weighed_kg became an exact copy of declared_kg"));
        await SimulatedCrash.ArmAsync(before.Database, crashAt);

        var crash = await Assert.ThrowsAnyAsync<Exception>(() => before.Evaluation.EvaluateNewRunsAsync(CancellationToken.None));
        Assert.Contains(SimulatedCrash.Message, crash.Message, StringComparison.Ordinal);
        await SimulatedCrash.DisarmAsync(before.Database, crashAt);

        // Nothing of the crashed cycle is stored: not the states, not the mail, not the watermark.
        Assert.Empty(await before.Alerts.GetOpenAlertsAsync(null, CancellationToken.None));
        Assert.Empty(await before.Outbox.ListOutboxAsync(false, 10, CancellationToken.None));
        Assert.Equal(0, await before.Feed.GetWatermarkAsync(RunFeed.AlertsWatermarkKey, CancellationToken.None));

        var after = new EvaluationHarness(await DatabaseAsync(), config, time);
        await after.Evaluation.EvaluateNewRunsAsync(CancellationToken.None);

        await AssertJudgedOnceAsync(after, run1);
    }

    [Fact]
    public async Task Evaluate_CrashRightAfterTheCommit_RestartFindsNothingLeftToJudge()
    {
        var config = Config(_mailFolder, "parcels");
        var time = new FakeTimeProvider(Start);
        var before = new EvaluationHarness(await DatabaseAsync(), config, time);
        var run1 = await before.RecordAsync("parcels", Warning("slope moved from 0.50 to 0.90"), Critical("weighed_kg became an exact copy of declared_kg"));
        Assert.Single(await before.Evaluation.EvaluateNewRunsAsync(CancellationToken.None));

        // The process dies as soon as the cycle is committed; the next one starts from the store alone.
        var after = new EvaluationHarness(await DatabaseAsync(), config, time);
        Assert.Empty(await after.Evaluation.EvaluateNewRunsAsync(CancellationToken.None));

        await AssertJudgedOnceAsync(after, run1);
    }

    [Fact]
    public async Task Evaluate_CycleThatChangesNothing_StillAdvancesTheWatermark()
    {
        var harness = new EvaluationHarness(await DatabaseAsync(), Config(_mailFolder, "parcels"), new FakeTimeProvider(Start));
        var quiet = await harness.RecordAsync("parcels");

        var cycles = await harness.Evaluation.EvaluateNewRunsAsync(CancellationToken.None);

        Assert.Empty(Assert.Single(cycles).Saved);
        Assert.Equal(quiet, await harness.Feed.GetWatermarkAsync(RunFeed.AlertsWatermarkKey, CancellationToken.None));
        Assert.Empty(await harness.Evaluation.EvaluateNewRunsAsync(CancellationToken.None));
    }

    [Fact]
    public async Task Evaluate_OneRunsProfileDoesNotParse_OtherPairsAreStillJudged_AndTheRunIsCountedAndPassed()
    {
        var harness = new EvaluationHarness(await DatabaseAsync(), Config(_mailFolder, "parcels", "invoices"), new FakeTimeProvider(Start));
        var good = await harness.RecordAsync("parcels", Critical("weighed_kg became an exact copy of declared_kg"));
        var corrupt = await harness.RecordAsync("invoices", Critical("net became an exact copy of gross"));
        await using (var connection = await harness.Database.OpenAsync(CancellationToken.None))
        {
            // Cut short, as a disk fault or a hand edit might leave it: not JSON any more.
            Assert.Equal(1, await connection.ExecuteAsync("UPDATE runs SET profile_json = '{\"n_rows\": 11, \"pear' WHERE id = @corrupt", new { corrupt }));
        }

        await harness.Evaluation.EvaluateNewRunsAsync(CancellationToken.None);
        var open = await harness.Alerts.GetOpenAlertsAsync(null, CancellationToken.None);
        var queued = await harness.Outbox.ListOutboxAsync(false, 10, CancellationToken.None);

        var alert = Assert.Single(open);
        Assert.Equal(("parcels", AlertStatus.Confirmed, good), (alert.Pair, alert.Status, alert.LastRunId));
        Assert.Single(queued);
        Assert.Equal(corrupt, await harness.Feed.GetWatermarkAsync(RunFeed.AlertsWatermarkKey, CancellationToken.None));
        Assert.Equal(1, await harness.Feed.GetUnreadableCountAsync(RunFeed.AlertsWatermarkKey, CancellationToken.None));

        // The pair of the unreadable run goes on alerting from its next readable run.
        var next = await harness.RecordAsync("invoices", Critical("net became an exact copy of gross"));
        await harness.Evaluation.EvaluateNewRunsAsync(CancellationToken.None);
        var invoices = Assert.Single(await harness.Alerts.GetOpenAlertsAsync(["invoices"], CancellationToken.None));
        Assert.Equal((AlertStatus.Confirmed, next), (invoices.Status, invoices.LastRunId));
        Assert.Equal(1, await harness.Feed.GetUnreadableCountAsync(RunFeed.AlertsWatermarkKey, CancellationToken.None));
    }

    public void Dispose()
    {
        Dispose(true);
        GC.SuppressFinalize(this);
    }

    protected virtual void Dispose(bool disposing)
    {
        if (disposing)
        {
            Directory.Delete(_mailFolder, recursive: true);
        }
    }

    /// <summary>
    /// Run 1 was judged exactly once (the warning is watching after one run, the critical alert confirmed with one
    /// mail), the watermark stands at it, and run 2 then confirms the warning as its second run in a row.
    /// </summary>
    private static async Task AssertJudgedOnceAsync(EvaluationHarness harness, long run1)
    {
        var open = (await harness.Alerts.GetOpenAlertsAsync(null, CancellationToken.None)).ToDictionary(a => a.Kind);
        Assert.Equal((AlertStatus.Watching, 1, run1), (open[FindingKind.SlopeShift].Status, open[FindingKind.SlopeShift].ConsecutiveRuns, open[FindingKind.SlopeShift].LastRunId));
        Assert.Equal((AlertStatus.Confirmed, 1), (open[FindingKind.BecamePerfect].Status, open[FindingKind.BecamePerfect].ConsecutiveRuns));
        Assert.Single(await harness.Outbox.ListOutboxAsync(false, 10, CancellationToken.None));
        Assert.Equal(run1, await harness.Feed.GetWatermarkAsync(RunFeed.AlertsWatermarkKey, CancellationToken.None));

        var run2 = await harness.RecordAsync("parcels", Warning("slope moved from 0.50 to 0.91"));
        await harness.Evaluation.EvaluateNewRunsAsync(CancellationToken.None);

        var warning = Assert.Single(await harness.Alerts.GetOpenAlertsAsync(["parcels"], CancellationToken.None), a => a.Kind == FindingKind.SlopeShift);
        Assert.Equal((AlertStatus.Confirmed, 2, run2), (warning.Status, warning.ConsecutiveRuns, warning.LastRunId));
    }
}
