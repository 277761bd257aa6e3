using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.IntegrationTests.Store;
using DriftWatch.Monitoring;
using DriftWatch.Store;
using MathNet.Numerics.Statistics;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>The baseline policies end to end: runs recorded in a real store, pooled with the real profiler.</summary>
public abstract class BaselineServiceContract : IAsyncLifetime
{
    private static readonly DateTimeOffset T0 = new(2026, 4, 1, 0, 0, 0, TimeSpan.Zero);
    private readonly IStoreDatabaseFactory _factory;
    private HistoryStore _store = null!;
    private BaselineService _service = null!;

    private protected BaselineServiceContract(IStoreDatabaseFactory factory) => _factory = factory;

    public async Task InitializeAsync()
    {
        var database = await _factory.CreateAsync();
        await new MigrationRunner(database).MigrateAsync(CancellationToken.None);
        _store = new HistoryStore(database, pointsPerRun: 100);
        _service = new BaselineService(_store, Profiler.Profile, resets: new BaselineResetStore(database));
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    private static PairConfig Pair(BaselinePolicy policy) => new()
    {
        Name = "shipments.weight_vs_cost",
        Source = "warehouse",
        Table = "shipments",
        X = "weight",
        Y = "cost",
        Baseline = policy,
    };

    /// <summary>A run at hour <paramref name="hour"/> whose 100 points x = 1000·hour + i carry y = slope·x + (i mod 5).</summary>
    private async Task RecordAsync(PairConfig pair, int hour, double slope = 2, Severity? worst = null)
    {
        var x = Enumerable.Range(0, 100).Select(i => (1000.0 * hour) + i).ToArray();
        var y = x.Select((v, i) => (slope * v) + (i % 5)).ToArray();
        var sample = new PairedSample(x, y, nullCount: 10);
        Finding[] findings = worst is { } s ? [new Finding(FindingKind.CorrelationShift, s, 1e-6, 0.4, "shifted")] : [];
        await _store.RecordRunAsync(
            new NewRun(pair.Name, T0.AddHours(hour), T0.AddHours(hour).AddSeconds(3), RunStatus.Succeeded, null, Profiler.Profile(sample, Thresholds.Default), findings, null, sample, "all 110"),
            CancellationToken.None);
    }

    private static int[] HoursIn(StoredBaseline baseline) => [.. baseline.Points.X.Select(x => (int)(x / 1000)).Distinct().Order()];

    [Fact]
    public async Task FirstRuns_NoneUntilNRuns_ThenPooledOnce_AndKept()
    {
        var pair = Pair(new BaselinePolicy { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 3 });
        await RecordAsync(pair, 0);
        await RecordAsync(pair, 1);

        Assert.Null(await _service.GetOrBuildAsync(pair, T0.AddHours(2), CancellationToken.None));

        await RecordAsync(pair, 2);
        var built = (await _service.GetOrBuildAsync(pair, T0.AddHours(3), CancellationToken.None))!;
        await RecordAsync(pair, 3, slope: -5);
        var later = (await _service.GetOrBuildAsync(pair, T0.AddHours(9), CancellationToken.None))!;

        Assert.Equal([0, 1, 2], HoursIn(built));
        Assert.Equal(300, built.Points.UsedCount);
        Assert.Equal(3, built.RunCount);
        // Oracle for the pooled figures: MathNet's Pearson over the 300 stored points; counts are one run's.
        Assert.Equal(Correlation.Pearson(built.Points.X, built.Points.Y), built.Profile.PearsonR!.Value, 10);
        Assert.Equal(100, built.Profile.NUsed);
        Assert.Equal(110, built.Profile.NRows);
        Assert.Equal(built.CreatedAt, later.CreatedAt);
        Assert.Equal([0, 1, 2], HoursIn(later));
        Assert.Equal(built.PolicyText, (await _store.GetBaselineAsync(pair.Name, CancellationToken.None))!.PolicyText);
    }

    [Fact]
    public async Task Accept_AdoptsTheLatestRun_AndReset_RebuildsByThePolicy_FromTheNextRunsOnly()
    {
        var pair = Pair(new BaselinePolicy { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 2 });
        for (var h = 0; h < 4; h++)
        {
            await RecordAsync(pair, h, slope: h < 3 ? 2 : 7);
        }

        var accepted = (await _service.AcceptLatestAsync(pair, T0.AddHours(5), CancellationToken.None))!;
        var kept = (await _service.GetOrBuildAsync(pair, T0.AddHours(6), CancellationToken.None))!;

        Assert.True(accepted.Accepted);
        Assert.Equal([3], HoursIn(accepted));
        // Oracle: MathNet's least-squares line through the accepted run's points (y = 7x + (i mod 5)).
        Assert.Equal(MathNet.Numerics.Fit.Line(accepted.Points.X, accepted.Points.Y).B, accepted.Profile.Slope!.Value, 9);
        Assert.InRange(accepted.Profile.Slope!.Value, 6.99, 7.01);
        Assert.True(kept.Accepted);
        Assert.Equal([3], HoursIn(kept));

        Assert.True(await _service.ResetAsync(pair.Name, T0.AddHours(6).AddMinutes(30), CancellationToken.None));
        Assert.Equal(T0.AddHours(6).AddMinutes(30), await _service.GetResetAsync(pair.Name, CancellationToken.None));

        // The four runs stored before the reset describe what was reset: first_runs 2 waits for two new ones.
        Assert.Null(await _service.GetOrBuildAsync(pair, T0.AddHours(7), CancellationToken.None));
        await RecordAsync(pair, 8, slope: 3);
        Assert.Null(await _service.GetOrBuildAsync(pair, T0.AddHours(8).AddMinutes(1), CancellationToken.None));
        await RecordAsync(pair, 9, slope: 3);
        var rebuilt = (await _service.GetOrBuildAsync(pair, T0.AddHours(9).AddMinutes(1), CancellationToken.None))!;
        Assert.False(rebuilt.Accepted);
        Assert.Equal([8, 9], HoursIn(rebuilt));
        // Oracle: MathNet's least-squares line through the pooled points of the two new runs (y = 3x + (i mod 5)).
        Assert.Equal(MathNet.Numerics.Fit.Line(rebuilt.Points.X, rebuilt.Points.Y).B, rebuilt.Profile.Slope!.Value, 9);
    }

    [Fact]
    public async Task Reset_UnderARollingPolicy_NeverReachesBackPastTheReset()
    {
        var pair = Pair(new BaselinePolicy { Kind = BaselinePolicyKind.Rolling, RollingPeriod = TimeSpan.FromHours(10) });
        for (var h = 0; h < 6; h++)
        {
            await RecordAsync(pair, h);
        }

        var before = (await _service.GetOrBuildAsync(pair, T0.AddHours(6), CancellationToken.None))!;
        Assert.Equal([0, 1, 2, 3, 4, 5], HoursIn(before));
        await _service.ResetAsync(pair.Name, T0.AddHours(6).AddMinutes(10), CancellationToken.None);
        for (var h = 7; h < 9; h++)
        {
            await RecordAsync(pair, h);
        }

        // The rolling period [−1 h, 9 h) still covers hours 0–5, but they came before the reset.
        var after = (await _service.GetOrBuildAsync(pair, T0.AddHours(9), CancellationToken.None))!;
        Assert.Equal([7, 8], HoursIn(after));

        // Accepting a run clears the reset: the accepted run anchors the rolling period from then on.
        var accepted = (await _service.AcceptLatestAsync(pair, T0.AddHours(9).AddMinutes(5), CancellationToken.None))!;
        Assert.Equal([8], HoursIn(accepted));
        Assert.Null(await _service.GetResetAsync(pair.Name, CancellationToken.None));
    }

    [Fact]
    public async Task Rolling_PoolsThePeriod_SkippingRunsWithCriticalFindings()
    {
        var pair = Pair(new BaselinePolicy { Kind = BaselinePolicyKind.Rolling, RollingPeriod = TimeSpan.FromHours(6) });
        for (var h = 0; h < 10; h++)
        {
            await RecordAsync(pair, h, worst: h == 6 ? Severity.Critical : h == 7 ? Severity.Warning : null);
        }

        var baseline = (await _service.GetOrBuildAsync(pair, T0.AddHours(10), CancellationToken.None))!;

        // [4 h, 10 h) without the critical run at 6 h.
        Assert.Equal([4, 5, 7, 8, 9], HoursIn(baseline));
        Assert.Equal(T0.AddHours(4), baseline.CoversFrom);
        Assert.Equal(T0.AddHours(9), baseline.CoversTo);
        Assert.Equal(BaselinePolicyKind.Rolling, (await _store.GetBaselineAsync(pair.Name, CancellationToken.None))!.Policy);
    }

    [Fact]
    public async Task FirstRuns_WhenEarlyPointsWerePruned_PagesOnToRunsThatStillHaveThem()
    {
        var pair = Pair(new BaselinePolicy { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 3 });
        for (var h = 0; h < 6; h++)
        {
            await RecordAsync(pair, h);
        }

        await _store.PruneAsync(T0.AddDays(-1), T0.AddHours(2), CancellationToken.None);
        var baseline = (await _service.GetOrBuildAsync(pair, T0.AddHours(7), CancellationToken.None))!;

        Assert.Equal([2, 3, 4], HoursIn(baseline));
    }
}

public sealed class SqliteBaselineServiceTests() : BaselineServiceContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresBaselineServiceTests(PostgresServer server) : BaselineServiceContract(new PostgresStoreDatabaseFactory(server));
