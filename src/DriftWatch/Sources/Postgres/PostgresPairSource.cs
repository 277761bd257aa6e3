using System.Data;
using System.Globalization;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using Npgsql;
using Npgsql.PostgresTypes;
using NpgsqlTypes;

namespace DriftWatch.Sources.Postgres;

/// <summary>
/// Reads pairs from PostgreSQL. Each check is one session and one REPEATABLE READ, READ ONLY transaction
/// (so the push-down figures and the sample see the same snapshot) with a local statement timeout; the
/// session is rolled back at the end. At most <see cref="SourceConfig.MaxConcurrentQueries"/> checks of this
/// source run at once.
/// </summary>
internal sealed partial class PostgresPairSource : IPairSource, IGroupSource, IAsyncDisposable
{
    /// <summary>The application_name every source session carries, so a DBA can see and limit the monitor.</summary>
    public const string ApplicationName = "driftwatch";

    // Types whose values are numbers; a domain counts by its base type.
    private static readonly HashSet<string> NumericTypes = ["int2", "int4", "int8", "float4", "float8", "numeric"];
    private static readonly HashSet<string> TimeTypes = ["date", "timestamp", "timestamptz"];

    private readonly NpgsqlDataSource _dataSource;
    private readonly SemaphoreSlim _gate;
    private readonly string _endpoint;

    /// <param name="hints">Where shared reads keep what they learn about columns; none keeps it in this object only.</param>
    public PostgresPairSource(SourceConfig config, IColumnHints? hints = null)
    {
        ArgumentNullException.ThrowIfNull(config);
        Config = config;
        _hints = hints;
        var builder = new NpgsqlConnectionStringBuilder(config.ConnectionString)
        {
            ApplicationName = ApplicationName,
            // The server's statement_timeout decides; the client waits a little longer so the server's clear error wins.
            CommandTimeout = config.StatementTimeout <= TimeSpan.Zero ? 0 : (int)Math.Ceiling(config.StatementTimeout.TotalSeconds) + 5,
        };
        _endpoint = $"{builder.Host}:{builder.Port.ToString(CultureInfo.InvariantCulture)}";
        _dataSource = NpgsqlDataSource.Create(builder);
        _gate = new SemaphoreSlim(Math.Max(1, config.MaxConcurrentQueries));
    }

    public SourceConfig Config { get; }

    public async Task<SampledPair> SampleAsync(PairConfig pair, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var target = PairTarget.From(pair);
        return await InSessionAsync(pair, target, async (connection, ct) =>
        {
            var (sql, windowEnd) = await CheckColumnsAsync(connection, pair, target, now, ct);
            var figures = await ReadFiguresAsync(connection, sql, ct);

            var needsEstimate = target.IsTable && pair.Sample.Method is SampleMethod.Auto or SampleMethod.Tablesample;
            var estimate = needsEstimate ? await EstimateRowsAsync(connection, target.Table!, ct) : null;
            var plan = SamplePlanner.Choose(pair.Sample, figures.RowCount, estimate, pair.Window is not null || target.Where is not null);
            if (pair.Sample.Seed is { } seed && plan.Draw != SampleDraw.All)
            {
                await ExecuteAsync(connection, "SELECT setseed($1)", p => p.Add(SeedFraction(seed), NpgsqlDbType.Double), ct);
            }

            var sample = await ReadSampleAsync(connection, sql, plan, pair.Sample, ct);
            return new SampledPair(sample, figures, Describe(plan, pair.Sample, sample)) { WindowEnd = windowEnd };
        }, cancellationToken);
    }

    public async Task<IReadOnlyList<DrivingRow>> FarthestFromLineAsync(
        PairConfig pair, DateTimeOffset now, double intercept, double slope, int count, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        LineDistance.CheckCount(count);
        var line = LineDistance.For(intercept, slope);
        var target = PairTarget.From(pair);
        return await InSessionAsync(pair, target, async (connection, ct) =>
        {
            var (sql, _) = await CheckColumnsAsync(connection, pair, target, now, ct);
            var (text, parameters) = sql.Farthest(line, count);
            await using var batch = new NpgsqlBatch(connection);
            batch.BatchCommands.Add(parameters.Command(text));
            await using var reader = await batch.ExecuteReaderAsync(ct);
            var rows = new List<DrivingRow>(count);
            while (await reader.ReadAsync(ct))
            {
                double x = reader.GetDouble(0), y = reader.GetDouble(1);
                rows.Add(new DrivingRow(x, y, line.Residual(x, y)));
            }

            return (IReadOnlyList<DrivingRow>)rows;
        }, cancellationToken);
    }

    public async Task ValidateAsync(PairConfig pair, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var target = PairTarget.From(pair);
        await InSessionAsync(pair, target, async (connection, ct) =>
        {
            await CheckColumnsAsync(connection, pair, target, null, ct);
            return true;
        }, cancellationToken);
    }

    public async Task<DateTimeOffset?> LatestAsync(PairConfig pair, DateTimeOffset at, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var target = PairTarget.From(pair);
        return await InSessionAsync(pair, target, async (connection, ct) =>
        {
            await CheckColumnsAsync(connection, pair, target, null, ct);
            return pair.Window is null ? null : await ReadLatestAsync(connection, new PostgresPairSql(target, null), at, ct);
        }, cancellationToken);
    }

    public async ValueTask DisposeAsync()
    {
        await _dataSource.DisposeAsync();
        _gate.Dispose();
    }

    private async Task<T> InSessionAsync<T>(PairConfig pair, PairTarget target, Func<NpgsqlConnection, CancellationToken, Task<T>> work, CancellationToken cancellationToken)
    {
        await _gate.WaitAsync(cancellationToken);
        NpgsqlConnection? connection = null;
        try
        {
            try
            {
                connection = await _dataSource.OpenConnectionAsync(cancellationToken);
            }
            catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
            {
                throw PostgresErrors.Map(e, pair.Name, Config.Name, _endpoint, target: null);
            }

            try
            {
                await using var transaction = await connection.BeginTransactionAsync(IsolationLevel.RepeatableRead, cancellationToken);
                await using (var batch = new NpgsqlBatch(connection))
                {
                    batch.BatchCommands.Add(new NpgsqlBatchCommand("SET TRANSACTION READ ONLY"));
                    var p = new PositionalParameters();
                    var timeout = p.Add(TimeoutText(Config.StatementTimeout), NpgsqlDbType.Text);
                    // UTC so timestamp-without-time-zone window columns are read as UTC.
                    batch.BatchCommands.Add(p.Command($"SELECT set_config('statement_timeout', {timeout}, true), set_config('TimeZone', 'UTC', true)"));
                    await batch.ExecuteNonQueryAsync(cancellationToken);
                }

                var result = await work(connection, cancellationToken);
                await transaction.RollbackAsync(cancellationToken);
                return result;
            }
            catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
            {
                throw PostgresErrors.Map(e, pair.Name, Config.Name, _endpoint, target.Describe);
            }
        }
        finally
        {
            if (connection is not null)
            {
                await connection.DisposeAsync();
            }

            _gate.Release();
        }
    }

    /// <summary>
    /// Checks the columns' types and returns the SQL for them (numeric columns get the range guard), over the window
    /// of a check at <paramref name="at"/> (none when null), and where that window ends (see <see cref="WindowRange"/>).
    /// </summary>
    private static async Task<(PostgresPairSql Sql, DateTimeOffset? WindowEnd)> CheckColumnsAsync(
        NpgsqlConnection connection, PairConfig pair, PairTarget target, DateTimeOffset? at, CancellationToken ct)
    {
        var (text, parameters) = new PostgresPairSql(target, null).Probe();
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(parameters.Command(text));
        await using var reader = await batch.ExecuteReaderAsync(CommandBehavior.SchemaOnly, ct);
        string[] names = pair.Window is null ? [pair.X, pair.Y] : [pair.X, pair.Y, pair.Window.Column];
        var numeric = new bool[2];
        for (var i = 0; i < names.Length; i++)
        {
            var type = reader.GetPostgresType(i);
            var baseType = type is PostgresDomainType domain ? domain.BaseType : type;
            var internalName = baseType?.InternalName ?? "unknown";
            var isWindow = i == 2;
            var ok = isWindow ? TimeTypes.Contains(internalName) : NumericTypes.Contains(internalName);
            if (!ok)
            {
                var typeName = type?.DisplayName ?? internalName;
                throw isWindow
                    ? new SourceException(SourceFailure.QueryError, $"Pair '{pair.Name}' ({target.Describe}): window column {names[i]} is {typeName}; it must be a date or timestamp.")
                    : new SourceException(SourceFailure.NonNumericColumn, $"Pair '{pair.Name}' ({target.Describe}): column {names[i]} is {typeName}, not a number.");
            }

            if (!isWindow)
            {
                numeric[i] = internalName == "numeric";
            }
        }

        await reader.DisposeAsync();
        WindowRange? range = null;
        DateTimeOffset? end = null;
        if (pair.Window is { } window && at is { } t)
        {
            end = window.Anchor == WindowAnchor.Latest ? await ReadLatestAsync(connection, new PostgresPairSql(target, null), t, ct) : t;
            // No value at or before t: the window ending at t is just as empty, and the run says so (unmeasurable).
            range = end is { } newest && window.Anchor == WindowAnchor.Latest ? WindowRange.Through(window, newest) : WindowRange.EndingAt(window, t);
        }

        return (new PostgresPairSql(target, range, numeric[0], numeric[1]), end);
    }

    private static async Task<DateTimeOffset?> ReadLatestAsync(NpgsqlConnection connection, PostgresPairSql sql, DateTimeOffset at, CancellationToken ct)
    {
        var (text, parameters) = sql.Latest(at);
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(parameters.Command(text));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        return await reader.ReadAsync(ct) && !reader.IsDBNull(0)
            ? new DateTimeOffset(DateTime.SpecifyKind(reader.GetFieldValue<DateTime>(0), DateTimeKind.Utc))
            : null;
    }

    /// <summary>
    /// The push-down figures. The plain aggregate runs first, behind a savepoint in the same round trip; when
    /// float8 arithmetic overflows on it (values near 1e300 square beyond float8's range, SQLSTATE 22003), or
    /// its figures cannot be trusted (<see cref="Rescaling.Needed"/>: corr() silently losing r to the overflow
    /// of Sxx·Syy, or a small spread on a huge offset), the figures are computed again on rescaled values: one
    /// more scan for the columns' ranges, one for the rescaled aggregate. The common case stays one scan.
    /// </summary>
    private static async Task<SourceFigures> ReadFiguresAsync(NpgsqlConnection connection, PostgresPairSql sql, CancellationToken ct)
    {
        const string Savepoint = "driftwatch_figures";
        try
        {
            var figures = await ReadAggregateAsync(connection, sql.Aggregate(), "SAVEPOINT " + Savepoint, ct);
            if (!Rescaling.Needed(figures))
            {
                return figures;
            }
        }
        catch (PostgresException e) when (e.SqlState == PostgresErrorCodes.NumericValueOutOfRange)
        {
            await ExecuteAsync(connection, "ROLLBACK TO SAVEPOINT " + Savepoint, _ => { }, ct);
        }

        var rescaling = await ReadRescalingAsync(connection, sql, ct);
        return rescaling.Restore(await ReadAggregateAsync(connection, sql.Aggregate(rescaling), null, ct));
    }

    private static async Task<SourceFigures> ReadAggregateAsync(
        NpgsqlConnection connection, (string Sql, PositionalParameters Parameters) aggregate, string? before, CancellationToken ct)
    {
        await using var batch = new NpgsqlBatch(connection);
        if (before is not null)
        {
            batch.BatchCommands.Add(new NpgsqlBatchCommand(before));
        }

        batch.BatchCommands.Add(aggregate.Parameters.Command(aggregate.Sql));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        await reader.ReadAsync(ct);
        return new SourceFigures(
            reader.GetInt64(0),
            reader.GetInt64(2),
            reader.GetInt64(1),
            FiniteOrNull(reader, 3),
            FiniteOrNull(reader, 4),
            FiniteOrNull(reader, 5),
            FiniteOrNull(reader, 6),
            FiniteOrNull(reader, 7),
            FiniteOrNull(reader, 8),
            FiniteOrNull(reader, 9));
    }

    private static async Task<Rescaling> ReadRescalingAsync(NpgsqlConnection connection, PostgresPairSql sql, CancellationToken ct)
    {
        var (text, parameters) = sql.Range();
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(parameters.Command(text));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        await reader.ReadAsync(ct);
        return Rescaling.For(FiniteOrNull(reader, 0), FiniteOrNull(reader, 1), FiniteOrNull(reader, 2), FiniteOrNull(reader, 3));
    }

    /// <summary>The planner's row estimate, or null when the relation cannot be table-sampled (a view, a foreign table).</summary>
    private static async Task<double?> EstimateRowsAsync(NpgsqlConnection connection, QualifiedName table, CancellationToken ct)
    {
        const string sql = """
            SELECT c.relkind::text,
                   CASE WHEN c.relkind = 'p'
                        THEN (SELECT coalesce(sum(greatest(l.reltuples, 0)), 0)::float8
                              FROM pg_partition_tree(c.oid) t JOIN pg_class l ON l.oid = t.relid WHERE t.isleaf)
                        ELSE c.reltuples::float8 END
            FROM pg_class c WHERE c.oid = to_regclass($1)
            """;
        await using var batch = new NpgsqlBatch(connection);
        var p = new PositionalParameters();
        p.Add(table.Quoted, NpgsqlDbType.Text);
        batch.BatchCommands.Add(p.Command(sql));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        if (!await reader.ReadAsync(ct))
        {
            return null;
        }

        var kind = reader.GetString(0);
        return kind is "r" or "m" or "p" ? reader.GetDouble(1) : null;
    }

    private static async Task<PairedSample> ReadSampleAsync(NpgsqlConnection connection, PostgresPairSql sql, SamplePlan plan, SampleSpec spec, CancellationToken ct)
    {
        var (text, parameters) = sql.Sample(plan, spec.Rows, spec.Seed, spec.Bernoulli);
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(parameters.Command(text));
        await using var reader = await batch.ExecuteReaderAsync(CommandBehavior.SequentialAccess, ct);
        var builder = new PairedSampleBuilder(plan.Draw == SampleDraw.All ? 0 : spec.Rows);
        var read = 0;
        while (await reader.ReadAsync(ct))
        {
            double? x = reader.IsDBNull(0) ? null : reader.GetDouble(0);
            double? y = reader.IsDBNull(1) ? null : reader.GetDouble(1);
            builder.Add(x, y);
            read++;
        }

        if (plan.Keep is not null && read < spec.Rows)
        {
            // The pre-filter kept too few rows (a chance near 1e-9): draw again from the whole window.
            await reader.DisposeAsync();
            return await ReadSampleAsync(connection, sql, plan with { Keep = null }, spec, ct);
        }

        return builder.Build();
    }

    private static async Task ExecuteAsync(NpgsqlConnection connection, string sql, Action<PositionalParameters> bind, CancellationToken ct)
    {
        var p = new PositionalParameters();
        bind(p);
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(p.Command(sql));
        await batch.ExecuteNonQueryAsync(ct);
    }

    private static string Describe(SamplePlan plan, SampleSpec spec, PairedSample sample)
    {
        var rows = sample.RowCount.ToString(CultureInfo.InvariantCulture);
        var text = plan.Draw switch
        {
            SampleDraw.All => $"all {rows}",
            SampleDraw.Random => $"random {rows}",
            _ => $"tablesample {(spec.Bernoulli ? "bernoulli" : "system")} {SamplePlanner.FormatPercent(plan.Percent!.Value)}% {rows}",
        };
        if (spec.Seed is { } seed && plan.Draw != SampleDraw.All)
        {
            text += " seed " + seed.ToString(CultureInfo.InvariantCulture);
        }

        return plan.Note is null ? text : $"{text} ({plan.Note})";
    }

    // setseed takes a value in [-1, 1].
    private static double SeedFraction(int seed) => Math.Clamp(seed / (double)int.MaxValue, -1.0, 1.0);

    private static string TimeoutText(TimeSpan timeout) =>
        timeout <= TimeSpan.Zero ? "0" : ((long)Math.Ceiling(timeout.TotalMilliseconds)).ToString(CultureInfo.InvariantCulture);

    private static double? FiniteOrNull(NpgsqlDataReader reader, int ordinal) =>
        reader.IsDBNull(ordinal) ? null : reader.GetDouble(ordinal) is var v && double.IsFinite(v) ? v : null;
}
