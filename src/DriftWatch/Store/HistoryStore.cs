using System.Data.Common;
using Dapper;
using DriftWatch.Core.Baselines;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Store;

/// <summary>
/// <see cref="IHistoryStore"/> over either dialect with one SQL text per operation (see <see cref="StoreDialect"/>).
/// Lists of runs are loaded by an id subquery shared by the runs and the findings query, because Dapper
/// expands <c>IN @list</c> for SQLite but sends an array to PostgreSQL.
/// </summary>
internal sealed class HistoryStore(IStoreDatabase database, int pointsPerRun = StoreConfig.DefaultPointsPerRun) : IHistoryStore
{
    private const string RunColumns =
        "id AS Id, pair AS Pair, started_at_ms AS StartedAtMs, finished_at_ms AS FinishedAtMs, status AS Status, error AS Error, " +
        "sample_method AS SampleMethod, profile_json AS ProfileJson, source_figures_json AS FiguresJson, baseline_json AS BaselineJson, " +
        "window_end_ms AS WindowEndMs, back_dated_at_ms AS BackDatedAtMs";

    private const string FindingColumns =
        "run_id AS RunId, kind AS Kind, severity AS Severity, p_value AS PValue, effect AS Effect, message AS Message";

    public IStoreDatabase Database => database;

    public async Task<long> RecordRunAsync(NewRun run, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(run);
        var points = run.Points is null ? null : PointsCodec.Encode(PointsCodec.Thin(run.Points, pointsPerRun));
        await using var connection = await database.OpenAsync(cancellationToken);
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        if (database.Dialect == StoreDialect.Postgres)
        {
            // Held until commit: the alert feed reads only when no run is being inserted (RunFeed.RecordLockKey).
            await connection.ExecuteAsync(new CommandDefinition(
                "SELECT pg_advisory_xact_lock_shared(@key)", new { key = RunFeed.RecordLockKey }, transaction, cancellationToken: cancellationToken));
        }

        // baseline_json is named only when there is one to write, so a run without a baseline is written by the
        // same statement a store before migration 005 took.
        var judged = run.JudgedAgainst is null ? string.Empty : ", baseline_json";
        var judgedValue = run.JudgedAgainst is null ? string.Empty : ", @BaselineJson";
        // Named only when set, as baseline_json: a run without them is the statement older stores took.
        if (run.WindowEnd is not null)
        {
            judged += ", window_end_ms";
            judgedValue += ", @WindowEndMs";
        }

        if (run.BackDatedAt is not null)
        {
            judged += ", back_dated_at_ms";
            judgedValue += ", @BackDatedAtMs";
        }

        if (run.RunKey is not null)
        {
            // Written at most once per key (migration 009's unique index backs this): a run the spool writes again
            // after a crash between the store write and the spool delete returns the id it already has.
            var existing = await connection.ExecuteScalarAsync<long?>(new CommandDefinition(
                "SELECT id FROM runs WHERE run_key = @RunKey", new { run.RunKey }, transaction, cancellationToken: cancellationToken));
            if (existing is { } known)
            {
                await transaction.CommitAsync(cancellationToken);
                return known;
            }

            judged += ", run_key";
            judgedValue += ", @RunKey";
        }

        if (run.SlotAt is not null)
        {
            // Named only when there is one, like baseline_json: runs without a slot are written as before migration 010.
            judged += ", slot_at_ms";
            judgedValue += ", @SlotAtMs";
        }

        var id = await connection.ExecuteScalarAsync<long>(new CommandDefinition(
            $"""
            INSERT INTO runs (pair, started_at_ms, finished_at_ms, status, error, sample_method, profile_json, source_figures_json, points{judged})
            VALUES (@Pair, @StartedAtMs, @FinishedAtMs, @Status, @Error, @SampleMethod, @ProfileJson, @FiguresJson, @Points{judgedValue})
            RETURNING id
            """,
            new
            {
                run.Pair,
                StartedAtMs = run.StartedAt.ToUnixTimeMilliseconds(),
                FinishedAtMs = run.FinishedAt.ToUnixTimeMilliseconds(),
                Status = StoreJson.EnumText(run.Status),
                run.Error,
                run.SampleMethod,
                ProfileJson = run.Profile is null ? null : StoreJson.Serialize(run.Profile),
                BaselineJson = run.JudgedAgainst is null ? null : StoreJson.Serialize(run.JudgedAgainst),
                FiguresJson = run.SourceFigures is null ? null : StoreJson.Serialize(run.SourceFigures),
                Points = points,
                run.RunKey,
                WindowEndMs = run.WindowEnd?.ToUnixTimeMilliseconds(),
                BackDatedAtMs = run.BackDatedAt?.ToUnixTimeMilliseconds(),
                SlotAtMs = run.SlotAt?.ToUnixTimeMilliseconds(),
            },
            transaction,
            cancellationToken: cancellationToken));

        if (run.Findings.Count > 0)
        {
            await connection.ExecuteAsync(new CommandDefinition(
                "INSERT INTO findings (run_id, pair, kind, severity, p_value, effect, message) VALUES (@RunId, @Pair, @Kind, @Severity, @PValue, @Effect, @Message)",
                run.Findings.Select(f => new
                {
                    RunId = id,
                    run.Pair,
                    Kind = StoreJson.EnumText(f.Kind),
                    Severity = StoreJson.EnumText(f.Severity),
                    PValue = Finite(f.PValue),
                    Effect = Finite(f.Effect),
                    f.Message,
                }),
                transaction,
                cancellationToken: cancellationToken));
        }

        await transaction.CommitAsync(cancellationToken);
        return id;
    }

    public Task<IReadOnlyList<RunRecord>> GetRunsAsync(string pair, int limit, bool includePoints, CancellationToken cancellationToken, DateTimeOffset? before = null)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(limit);
        var ids = before is null
            ? "SELECT id FROM runs WHERE pair = @Pair ORDER BY started_at_ms DESC, id DESC LIMIT @Limit"
            : "SELECT id FROM runs WHERE pair = @Pair AND started_at_ms < @Before ORDER BY started_at_ms DESC, id DESC LIMIT @Limit";
        return LoadRunsAsync(ids, new { Pair = pair, Limit = limit, Before = before?.ToUnixTimeMilliseconds() }, includePoints, newestFirst: true, cancellationToken);
    }

    public Task<IReadOnlyList<RunRecord>> GetSuccessfulRunsAsync(string pair, DateTimeOffset? from, DateTimeOffset? to, int? limit, CancellationToken cancellationToken)
    {
        // Half-open range [from, to), on the start time.
        var where = "pair = @Pair AND status = 'succeeded'"
            + (from is null ? string.Empty : " AND started_at_ms >= @From")
            + (to is null ? string.Empty : " AND started_at_ms < @To");
        var ids = $"SELECT id FROM runs WHERE {where} ORDER BY started_at_ms, id" + (limit is null ? string.Empty : " LIMIT @Limit");
        return LoadRunsAsync(
            ids,
            new { Pair = pair, From = from?.ToUnixTimeMilliseconds(), To = to?.ToUnixTimeMilliseconds(), Limit = limit },
            includePoints: true,
            newestFirst: false,
            cancellationToken);
    }

    public async Task<RunRecord?> GetRunAsync(long id, bool includePoints, CancellationToken cancellationToken)
    {
        var runs = await LoadRunsAsync("SELECT id FROM runs WHERE id = @Id", new { Id = id }, includePoints, newestFirst: true, cancellationToken);
        return runs.Count == 0 ? null : runs[0];
    }

    public Task<IReadOnlyList<RunRecord>> GetLatestRunsAsync(CancellationToken cancellationToken) =>
        LoadRunsAsync(
            "SELECT id FROM (SELECT id, ROW_NUMBER() OVER (PARTITION BY pair ORDER BY started_at_ms DESC, id DESC) AS rn FROM runs) latest WHERE rn = 1",
            null,
            includePoints: false,
            newestFirst: true,
            cancellationToken);

    public async Task<int> CountRunsAsync(string pair, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.ExecuteScalarAsync<int>(new CommandDefinition("SELECT COUNT(*) FROM runs WHERE pair = @Pair", new { Pair = pair }, cancellationToken: cancellationToken));
    }

    public async Task<StoredBaseline?> GetBaselineAsync(string pair, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var row = await connection.QuerySingleOrDefaultAsync<BaselineRow>(new CommandDefinition(
            """
            SELECT pair AS Pair, policy AS Policy, policy_text AS PolicyText, created_at_ms AS CreatedAtMs, covers_from_ms AS CoversFromMs,
                   covers_to_ms AS CoversToMs, run_count AS RunCount, accepted AS Accepted, profile_json AS ProfileJson, points AS Points,
                   mean_run_used AS MeanRunUsed, runs_json AS RunsJson
            FROM baselines WHERE pair = @Pair
            """,
            new { Pair = pair },
            cancellationToken: cancellationToken));
        return row?.ToBaseline();
    }

    public async Task SaveBaselineAsync(StoredBaseline baseline, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            """
            INSERT INTO baselines (pair, policy, policy_text, created_at_ms, covers_from_ms, covers_to_ms, run_count, accepted, profile_json, points, mean_run_used, runs_json)
            VALUES (@Pair, @Policy, @PolicyText, @CreatedAtMs, @CoversFromMs, @CoversToMs, @RunCount, @Accepted, @ProfileJson, @Points, @MeanRunUsed, @RunsJson)
            ON CONFLICT (pair) DO UPDATE SET
                policy = excluded.policy, policy_text = excluded.policy_text, created_at_ms = excluded.created_at_ms,
                covers_from_ms = excluded.covers_from_ms, covers_to_ms = excluded.covers_to_ms, run_count = excluded.run_count,
                accepted = excluded.accepted, profile_json = excluded.profile_json, points = excluded.points,
                mean_run_used = excluded.mean_run_used, runs_json = excluded.runs_json
            """,
            new
            {
                baseline.Pair,
                Policy = StoreJson.EnumText(baseline.Policy),
                baseline.PolicyText,
                CreatedAtMs = baseline.CreatedAt.ToUnixTimeMilliseconds(),
                CoversFromMs = baseline.CoversFrom.ToUnixTimeMilliseconds(),
                CoversToMs = baseline.CoversTo.ToUnixTimeMilliseconds(),
                baseline.RunCount,
                // An INTEGER column in both dialects: PostgreSQL will not take a boolean parameter for it.
                Accepted = baseline.Accepted ? 1 : 0,
                ProfileJson = StoreJson.Serialize(baseline.Profile),
                Points = PointsCodec.Encode(baseline.Points),
                MeanRunUsed = Finite(baseline.MeanRunUsed),
                RunsJson = StoreJson.Serialize(baseline.Runs),
            },
            cancellationToken: cancellationToken));
    }

    public async Task<bool> DeleteBaselineAsync(string pair, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition("DELETE FROM baselines WHERE pair = @Pair", new { Pair = pair }, cancellationToken: cancellationToken)) > 0;
    }

    public async Task<int> PruneAsync(DateTimeOffset runsBefore, DateTimeOffset pointsBefore, CancellationToken cancellationToken)
    {
        var args = new { RunsBefore = runsBefore.ToUnixTimeMilliseconds(), PointsBefore = pointsBefore.ToUnixTimeMilliseconds() };
        await using var connection = await database.OpenAsync(cancellationToken);
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        // Findings go first explicitly: the cascade needs SQLite's foreign_keys pragma, which a foreign connection may lack.
        await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM findings WHERE run_id IN (SELECT id FROM runs WHERE started_at_ms < @RunsBefore)", args, transaction, cancellationToken: cancellationToken));
        var deleted = await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM runs WHERE started_at_ms < @RunsBefore", args, transaction, cancellationToken: cancellationToken));
        await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE runs SET points = NULL WHERE started_at_ms < @PointsBefore AND points IS NOT NULL", args, transaction, cancellationToken: cancellationToken));
        await transaction.CommitAsync(cancellationToken);
        return deleted;
    }

    private async Task<IReadOnlyList<RunRecord>> LoadRunsAsync(string idQuery, object? args, bool includePoints, bool newestFirst, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var columns = includePoints ? RunColumns + ", points AS Points" : RunColumns;
        var rows = (await connection.QueryAsync<RunRow>(new CommandDefinition(
            $"SELECT {columns} FROM runs WHERE id IN ({idQuery})", args, cancellationToken: cancellationToken))).ToList();
        if (rows.Count == 0)
        {
            return [];
        }

        var findings = (await connection.QueryAsync<FindingRow>(new CommandDefinition(
                $"SELECT {FindingColumns} FROM findings WHERE run_id IN ({idQuery}) ORDER BY id", args, cancellationToken: cancellationToken)))
            .ToLookup(f => f.RunId);
        var ordered = newestFirst
            ? rows.OrderByDescending(r => r.StartedAtMs).ThenByDescending(r => r.Id)
            : rows.OrderBy(r => r.StartedAtMs).ThenBy(r => r.Id);
        return [.. ordered.Select(r => r.ToRecord([.. findings[r.Id].Select(f => f.ToFinding())]))];
    }

    private static double? Finite(double? value) => value is { } v && double.IsFinite(v) ? v : null;

    private static DateTimeOffset FromMs(long ms) => DateTimeOffset.FromUnixTimeMilliseconds(ms);

    // Dapper materialises these; the types absorb the dialects' differences (SQLite integers are Int64, PostgreSQL's INTEGER is Int32).
    private sealed class RunRow
    {
        public long Id { get; init; }
        public string Pair { get; init; } = "";
        public long StartedAtMs { get; init; }
        public long FinishedAtMs { get; init; }
        public string Status { get; init; } = "";
        public string? Error { get; init; }
        public string? SampleMethod { get; init; }
        public string? ProfileJson { get; init; }
        public string? FiguresJson { get; init; }
        public byte[]? Points { get; init; }
        public string? BaselineJson { get; init; }
        public long? WindowEndMs { get; init; }
        public long? BackDatedAtMs { get; init; }

        public RunRecord ToRecord(IReadOnlyList<Finding> findings) => new(
            Id,
            Pair,
            FromMs(StartedAtMs),
            FromMs(FinishedAtMs),
            StoreJson.ParseEnum<RunStatus>(Status),
            Error,
            StoreJson.Deserialize<RelationshipProfile>(ProfileJson),
            findings,
            StoreJson.Deserialize<SourceFigures>(FiguresJson),
            Points is null ? null : PointsCodec.Decode(Points),
            SampleMethod)
        {
            JudgedAgainst = StoreJson.Deserialize<BaselineSummary>(BaselineJson),
            WindowEnd = WindowEndMs is { } end ? FromMs(end) : null,
            BackDatedAt = BackDatedAtMs is { } made ? FromMs(made) : null,
        };
    }

    private sealed class FindingRow
    {
        public long RunId { get; init; }
        public string Kind { get; init; } = "";
        public string Severity { get; init; } = "";
        public double? PValue { get; init; }
        public double? Effect { get; init; }
        public string Message { get; init; } = "";

        public Finding ToFinding() => new(
            StoreJson.ParseEnum<FindingKind>(Kind),
            StoreJson.ParseEnum<Severity>(Severity),
            PValue,
            Effect,
            Message);
    }

    private sealed class BaselineRow
    {
        public string Pair { get; init; } = "";
        public string Policy { get; init; } = "";
        public string PolicyText { get; init; } = "";
        public long CreatedAtMs { get; init; }
        public long CoversFromMs { get; init; }
        public long CoversToMs { get; init; }
        public int RunCount { get; init; }
        public int Accepted { get; init; }
        public string ProfileJson { get; init; } = "";
        public byte[] Points { get; init; } = [];
        public double? MeanRunUsed { get; init; }

        public string? RunsJson { get; init; }

        public StoredBaseline ToBaseline() => new(
            Pair,
            StoreJson.ParseEnum<BaselinePolicyKind>(Policy),
            PolicyText,
            FromMs(CreatedAtMs),
            FromMs(CoversFromMs),
            FromMs(CoversToMs),
            RunCount,
            StoreJson.Deserialize<RelationshipProfile>(ProfileJson) ?? throw new FormatException($"Baseline of {Pair} has an empty profile."),
            PointsCodec.Decode(Points),
            Accepted != 0,
            MeanRunUsed)
        {
            Runs = StoreJson.Deserialize<List<RunFigures>>(RunsJson) ?? [],
        };
    }
}
