using System.Buffers.Binary;
using Dapper;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>The history store's behaviour, run against SQLite and PostgreSQL alike (one SQL text per operation).</summary>
public abstract class HistoryStoreContract : IAsyncLifetime
{
    protected const int PointsPerRun = 100;
    protected static readonly DateTimeOffset T0 = new(2026, 3, 1, 8, 0, 0, TimeSpan.Zero);

    private readonly IStoreDatabaseFactory _factory;

    private protected HistoryStoreContract(IStoreDatabaseFactory factory) => _factory = factory;

    private protected IStoreDatabase Database { get; private set; } = null!;

    private protected HistoryStore Store { get; private set; } = null!;

    private IReadOnlyList<string> InitialMigration { get; set; } = [];

    public async Task InitializeAsync()
    {
        Database = await _factory.CreateAsync();
        InitialMigration = await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);
        Store = new HistoryStore(Database, PointsPerRun);
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    public static RelationshipProfile FullProfile(double r) => new()
    {
        NRows = 260, NUsed = 250, NNull = 6, NNonfinite = 3, NNonNumeric = 1, DistinctX = 250, DistinctY = 249,
        XMean = 12.5, XSd = 3.25, YMean = -0.1, YSd = 1e-12, PearsonR = r, PearsonP = 1.5e-300, PearsonCiLow = r - 0.01, PearsonCiHigh = r + 0.01,
        SpearmanRho = 0.8, KendallTauB = 0.6, Intercept = 0.1 + 0.2, Slope = 1.0 / 3, SlopeSe = 0.001, InterceptSe = 0.002, RSquared = r * r,
        ResidualSd = 0.5, QuadraticCoef = -2e-5, QuadraticP = 0.04, QuadraticR2Gain = 0.03, OutlierCount = 2, OutlierRate = 0.008,
        MaxCooksDistance = 0.7, CooksOverThreshold = 0, MaxLeverage = 0.05, PearsonRWithoutTopInfluence = r - 0.02,
        ExactAffine = false, ExactIdentity = false, ExactMonotone = true, Equation = "y = 0.333·x + 0.3", Shape = Shape.Linear, ShapeReason = "straight line",
    };

    public static PairedSample Points(int n, double offset = 0) =>
        new([.. Enumerable.Range(0, n).Select(i => offset + i)], [.. Enumerable.Range(0, n).Select(i => (Math.PI * i) - offset)], nullCount: 4);

    public static NewRun Run(string pair, DateTimeOffset started, int points = 250, IReadOnlyList<Finding>? findings = null, RunStatus status = RunStatus.Succeeded) => new(
        pair,
        started,
        started.AddMilliseconds(1234),
        status,
        status == RunStatus.Failed ? "Pair 'p': cannot reach PostgreSQL at db:5432: Connection refused." : null,
        status == RunStatus.Failed ? null : FullProfile(0.9),
        findings ?? [],
        status == RunStatus.Failed ? null : new SourceFigures(1_000_000, 999_000, 1000, 0.91, 2.5, -1.0 / 7, 3.0, 4.0, 5.0, null),
        status == RunStatus.Failed ? null : Points(points),
        status == RunStatus.Failed ? null : "tablesample system 1.5% 10000");

    [Fact]
    public async Task Migrate_FromEmpty_AppliesEveryScript_AndARerunAppliesNothing()
    {
        var scripts = MigrationRunner.LoadScripts(Database.Dialect).Select(s => s.Name).ToList();

        var rerun = await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);

        Assert.Contains("001_history", scripts);
        Assert.Equal(scripts, InitialMigration);
        Assert.Empty(rerun);
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        Assert.Equal(scripts.Count, await connection.ExecuteScalarAsync<int>("SELECT COUNT(*) FROM schema_migrations"));
        Assert.Equal(0, await connection.ExecuteScalarAsync<int>("SELECT COUNT(*) FROM runs"));
        Assert.Equal(0, await connection.ExecuteScalarAsync<int>("SELECT COUNT(*) FROM baselines"));
    }

    [Fact]
    public async Task RecordRun_RoundTripsProfileFindingsFiguresAndThinnedPoints()
    {
        Finding[] findings =
        [
            new(FindingKind.CorrelationShift, Severity.Critical, 1e-9, -0.35, "r moved from 0.90 to 0.55"),
            new(FindingKind.NullSurge, Severity.Warning, null, 0.07, "null rate rose from 1% to 8%"),
        ];
        var run = Run("orders.amount_vs_tax", T0, findings: findings);

        var id = await Store.RecordRunAsync(run, CancellationToken.None);
        var stored = (await Store.GetRunAsync(id, includePoints: true, CancellationToken.None))!;

        Assert.Equal(run.Pair, stored.Pair);
        Assert.Equal(run.StartedAt, stored.StartedAt);
        Assert.Equal(run.FinishedAt, stored.FinishedAt);
        Assert.Equal(RunStatus.Succeeded, stored.Status);
        Assert.Equal(run.Profile, stored.Profile);
        Assert.Equal(findings, stored.Findings);
        Assert.Equal(run.SourceFigures, stored.SourceFigures);
        Assert.Equal(run.SampleMethod, stored.SampleMethod);
        Assert.Equal(Severity.Critical, stored.WorstSeverity);
        // 250 points thinned to 100 by an even stride: point i is source point floor(i · 250 / 100).
        var expected = Enumerable.Range(0, PointsPerRun).Select(i => i * 250 / PointsPerRun).ToArray();
        Assert.Equal(expected.Select(j => run.Points!.X[j]), stored.Points!.X);
        Assert.Equal(expected.Select(j => run.Points!.Y[j]), stored.Points.Y);
    }

    [Fact]
    public async Task RecordRun_WritesSnakeCaseJsonAndLittleEndianPointBlobs()
    {
        var id = await Store.RecordRunAsync(Run("p", T0, points: 3, findings: [new(FindingKind.PerfectRelationship, Severity.Critical, null, null, "exact")]), CancellationToken.None);

        await using var connection = await Database.OpenAsync(CancellationToken.None);
        var json = await connection.ExecuteScalarAsync<string>("SELECT profile_json FROM runs WHERE id = @id", new { id });
        var blob = await connection.ExecuteScalarAsync<byte[]>("SELECT points FROM runs WHERE id = @id", new { id });
        var finding = await connection.QuerySingleAsync<(string Kind, string Severity)>("SELECT kind, severity FROM findings WHERE run_id = @id", new { id });

        Assert.Contains("\"n_rows\":260", json, StringComparison.Ordinal);
        Assert.Contains("\"pearson_r_without_top_influence\":", json, StringComparison.Ordinal);
        Assert.Contains("\"shape\":\"linear\"", json, StringComparison.Ordinal);
        Assert.Equal(("perfect_relationship", "critical"), finding);
        // Decoded independently: IEEE-754 doubles, little-endian, x then y for each point.
        Assert.Equal(48, blob!.Length);
        Assert.Equal(2.0, BinaryPrimitives.ReadDoubleLittleEndian(blob.AsSpan(32)));
        Assert.Equal(2 * Math.PI, BinaryPrimitives.ReadDoubleLittleEndian(blob.AsSpan(40)));
    }

    [Fact]
    public async Task RecordRun_FailedRun_KeepsTheErrorAndNoProfile()
    {
        var run = Run("p", T0, status: RunStatus.Failed);

        var stored = (await Store.GetRunAsync(await Store.RecordRunAsync(run, CancellationToken.None), includePoints: true, CancellationToken.None))!;

        Assert.Equal(RunStatus.Failed, stored.Status);
        Assert.Equal(run.Error, stored.Error);
        Assert.Null(stored.Profile);
        Assert.Null(stored.Points);
        Assert.Null(stored.SourceFigures);
        Assert.Empty(stored.Findings);
    }

    [Fact]
    public async Task RecordRun_AFindingThatCannotBeWritten_LeavesNothingBehind()
    {
        // A null message breaks the findings table's NOT NULL: the run row written before it must roll back too.
        var broken = Run("p", T0, findings: [new(FindingKind.Outliers, Severity.Warning, null, null, null!)]);

        await Assert.ThrowsAnyAsync<Exception>(() => Store.RecordRunAsync(broken, CancellationToken.None));

        Assert.Equal(0, await Store.CountRunsAsync("p", CancellationToken.None));
    }

    [Fact]
    public async Task Queries_OrderLimitAndFilterRuns()
    {
        for (var i = 0; i < 6; i++)
        {
            await Store.RecordRunAsync(Run("a", T0.AddHours(i), status: i == 2 ? RunStatus.Failed : RunStatus.Succeeded), CancellationToken.None);
        }

        await Store.RecordRunAsync(Run("b", T0.AddHours(1)), CancellationToken.None);
        await Store.RecordRunAsync(Run("b", T0.AddHours(9)), CancellationToken.None);

        var newest = await Store.GetRunsAsync("a", 3, includePoints: false, CancellationToken.None);
        var before = await Store.GetRunsAsync("a", 10, includePoints: false, CancellationToken.None, before: T0.AddHours(2));
        var window = await Store.GetSuccessfulRunsAsync("a", T0.AddHours(1), T0.AddHours(5), null, CancellationToken.None);
        var firstTwo = await Store.GetSuccessfulRunsAsync("a", null, null, 2, CancellationToken.None);
        var latest = await Store.GetLatestRunsAsync(CancellationToken.None);

        Assert.Equal([T0.AddHours(5), T0.AddHours(4), T0.AddHours(3)], newest.Select(r => r.StartedAt));
        Assert.All(newest, r => Assert.Null(r.Points));
        Assert.Equal([T0.AddHours(1), T0], before.Select(r => r.StartedAt));
        // Half-open [1 h, 5 h), succeeded only (the run at 2 h failed), oldest first, with points.
        Assert.Equal([T0.AddHours(1), T0.AddHours(3), T0.AddHours(4)], window.Select(r => r.StartedAt));
        Assert.All(window, r => Assert.Equal(PointsPerRun, r.Points!.UsedCount));
        Assert.Equal([T0, T0.AddHours(1)], firstTwo.Select(r => r.StartedAt));
        Assert.Equal([("b", T0.AddHours(9)), ("a", T0.AddHours(5))], latest.Select(r => (r.Pair, r.StartedAt)).OrderBy(p => p.Pair == "a"));
        Assert.Equal(6, await Store.CountRunsAsync("a", CancellationToken.None));
        Assert.Null(await Store.GetRunAsync(123_456, includePoints: false, CancellationToken.None));
    }

    [Fact]
    public async Task Baselines_SaveReplaceLoadAndDelete()
    {
        var first = new StoredBaseline("p", BaselinePolicyKind.FirstRuns, "first_runs: 5", T0, T0.AddDays(-5), T0.AddDays(-1), 5, FullProfile(0.9), Points(40), false, 812.5);
        var second = first with { Policy = BaselinePolicyKind.Rolling, PolicyText = "rolling: 30d", CreatedAt = T0.AddDays(1), RunCount = 1, Profile = FullProfile(0.5), Points = Points(7, 3), Accepted = true, MeanRunUsed = null };

        Assert.Null(await Store.GetBaselineAsync("p", CancellationToken.None));
        await Store.SaveBaselineAsync(first, CancellationToken.None);
        var loaded = (await Store.GetBaselineAsync("p", CancellationToken.None))!;
        await Store.SaveBaselineAsync(second, CancellationToken.None);
        var replaced = (await Store.GetBaselineAsync("p", CancellationToken.None))!;

        AssertSameBaseline(first, loaded);
        AssertSameBaseline(second, replaced);
        Assert.True(await Store.DeleteBaselineAsync("p", CancellationToken.None));
        Assert.False(await Store.DeleteBaselineAsync("p", CancellationToken.None));
        Assert.Null(await Store.GetBaselineAsync("p", CancellationToken.None));
    }

    [Fact]
    public async Task Prune_DeletesOldRunsWithTheirFindings_AndDropsPointsOfOlderRuns()
    {
        Finding[] one = [new(FindingKind.Curvature, Severity.Info, 0.001, 0.05, "bend")];
        for (var day = 0; day < 10; day++)
        {
            await Store.RecordRunAsync(Run("p", T0.AddDays(day), findings: one), CancellationToken.None);
        }

        var deleted = await Store.PruneAsync(T0.AddDays(3), T0.AddDays(7), CancellationToken.None);

        var left = await Store.GetRunsAsync("p", 100, includePoints: true, CancellationToken.None);
        Assert.Equal(3, deleted);
        Assert.Equal(Enumerable.Range(3, 7).Reverse().Select(d => T0.AddDays(d)), left.Select(r => r.StartedAt));
        Assert.All(left, r => Assert.Equal(r.StartedAt >= T0.AddDays(7), r.Points is not null));
        Assert.All(left, r => Assert.Single(r.Findings));
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        Assert.Equal(7, await connection.ExecuteScalarAsync<int>("SELECT COUNT(*) FROM findings"));
    }

    [Fact]
    public async Task RecordRun_UnmeasurableRun_KeepsReasonProfileAndPointsAndIsNoSuccessfulRun()
    {
        // A constant x: the run keeps its counts and points for people, but no baseline query may return it.
        var points = new PairedSample([.. Enumerable.Repeat(8.0, 12)], [.. Enumerable.Range(0, 12).Select(i => (double)i)]);
        var profile = Profiler.Profile(points, Core.Statistics.Thresholds.Default);
        var run = new NewRun("p", T0, T0.AddSeconds(1), RunStatus.Unmeasurable, "x is constant (8) in all 12 usable rows", profile, [], null, points, "all");

        var id = await Store.RecordRunAsync(run, CancellationToken.None);
        var stored = (await Store.GetRunAsync(id, includePoints: true, CancellationToken.None))!;

        Assert.Equal(RunStatus.Unmeasurable, stored.Status);
        Assert.Equal(run.Error, stored.Error);
        Assert.Equal(profile, stored.Profile);
        Assert.Equal(points.X, stored.Points!.X);
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        Assert.Equal("unmeasurable", await connection.ExecuteScalarAsync<string>("SELECT status FROM runs WHERE id = @id", new { id }));
        Assert.Empty(await Store.GetSuccessfulRunsAsync("p", null, null, null, CancellationToken.None));
    }

    private static void AssertSameBaseline(StoredBaseline expected, StoredBaseline actual)
    {
        Assert.Equal(expected with { Points = PairedSample.Empty, Runs = [] }, actual with { Points = PairedSample.Empty, Runs = [] });
        Assert.Equal(expected.Runs, actual.Runs);
        Assert.Equal(expected.Points.X, actual.Points.X);
        Assert.Equal(expected.Points.Y, actual.Points.Y);
    }
}

public sealed class SqliteHistoryStoreTests() : HistoryStoreContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresHistoryStoreTests(PostgresServer server) : HistoryStoreContract(new PostgresStoreDatabaseFactory(server));
