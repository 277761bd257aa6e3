using System.Data;
using System.Globalization;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using MySqlConnector;

namespace DriftWatch.Sources.MySql;

/// <summary>
/// Reads pairs from MySQL or MariaDB. Each check is one session and one <c>START TRANSACTION WITH CONSISTENT
/// SNAPSHOT, READ ONLY</c> at REPEATABLE READ (the figures and the sample see the same snapshot), rolled back
/// at the end. The statement timeout is the server's own: <c>max_statement_time</c> (MariaDB, seconds) or
/// <c>max_execution_time</c> (MySQL, milliseconds). Configured SQL is checked to be one piece of one SELECT
/// (<see cref="MySqlConfiguredSql"/>), since a DDL statement would end the read-only transaction.
/// </summary>
internal sealed class MySqlPairSource : IPairSource, IDisposable
{
    private static readonly HashSet<MySqlDbType> NumericTypes =
    [
        MySqlDbType.Bool, MySqlDbType.Byte, MySqlDbType.UByte, MySqlDbType.Int16, MySqlDbType.UInt16, MySqlDbType.Int24, MySqlDbType.UInt24,
        MySqlDbType.Int32, MySqlDbType.UInt32, MySqlDbType.Int64, MySqlDbType.UInt64, MySqlDbType.Float, MySqlDbType.Double,
        MySqlDbType.Decimal, MySqlDbType.NewDecimal, MySqlDbType.Year,
    ];

    private static readonly HashSet<MySqlDbType> TimeTypes = [MySqlDbType.Date, MySqlDbType.Newdate, MySqlDbType.DateTime, MySqlDbType.Timestamp];

    private readonly string _connectionString;
    private readonly string _endpoint;
    private readonly SemaphoreSlim _gate;

    public MySqlPairSource(SourceConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        Config = config;
        var builder = new MySqlConnectionStringBuilder(config.ConnectionString)
        {
            // The server's timeout decides; the client waits a little longer so the server's clear error wins.
            DefaultCommandTimeout = config.StatementTimeout <= TimeSpan.Zero ? 0u : (uint)Math.Ceiling(config.StatementTimeout.TotalSeconds) + 5,
            ApplicationName = "driftwatch",
            // User variables (@name) stay server-side text; our parameters are named @p1, @p2, …
            AllowUserVariables = false,
        };
        _endpoint = $"{builder.Server}:{builder.Port.ToString(CultureInfo.InvariantCulture)}";
        _connectionString = builder.ConnectionString;
        _gate = new SemaphoreSlim(Math.Max(1, config.MaxConcurrentQueries));
    }

    public SourceConfig Config { get; }

    public Task<SampledPair> SampleAsync(PairConfig pair, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        return InSessionAsync(pair, async (session, target, ct) =>
        {
            var (sql, windowEnd) = await CheckColumnsAsync(session, pair, target, now, ct);
            var figures = await ReadFiguresAsync(session, sql, ct);
            var plan = SamplePlanner.Choose(pair.Sample, figures.RowCount, tableRows: null, filtered: true);
            var (text, parameters) = sql.Sample(plan, pair.Sample.Rows, figures.RowCount, pair.Sample.Seed);
            await using var command = session.Command(text, parameters);
            await using var reader = await command.ExecuteReaderAsync(ct);
            var builder = new PairedSampleBuilder(plan.Draw == SampleDraw.All ? 0 : pair.Sample.Rows);
            while (await reader.ReadAsync(ct))
            {
                builder.Add(reader.IsDBNull(0) ? null : reader.GetDouble(0), reader.IsDBNull(1) ? null : reader.GetDouble(1));
            }

            var sample = builder.Build();
            return new SampledPair(sample, figures, Describe(plan, pair.Sample, figures.RowCount, sample)) { WindowEnd = windowEnd };
        }, cancellationToken);
    }

    public Task<IReadOnlyList<DrivingRow>> FarthestFromLineAsync(
        PairConfig pair, DateTimeOffset now, double intercept, double slope, int count, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        LineDistance.CheckCount(count);
        var line = LineDistance.For(intercept, slope);
        return InSessionAsync(pair, async (session, target, ct) =>
        {
            var (sql, _) = await CheckColumnsAsync(session, pair, target, now, ct);
            var (text, parameters) = sql.Farthest(line, count);
            await using var command = session.Command(text, parameters);
            await using var reader = await command.ExecuteReaderAsync(ct);
            var rows = new List<DrivingRow>(count);
            while (await reader.ReadAsync(ct))
            {
                double x = reader.GetDouble(0), y = reader.GetDouble(1);
                rows.Add(new DrivingRow(x, y, line.Residual(x, y)));
            }

            return (IReadOnlyList<DrivingRow>)rows;
        }, cancellationToken);
    }

    public Task ValidateAsync(PairConfig pair, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        return InSessionAsync(pair, async (session, target, ct) =>
        {
            await CheckColumnsAsync(session, pair, target, null, ct);
            return true;
        }, cancellationToken);
    }

    public Task<DateTimeOffset?> LatestAsync(PairConfig pair, DateTimeOffset at, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        return InSessionAsync(pair, async (session, target, ct) =>
        {
            await CheckColumnsAsync(session, pair, target, null, ct);
            return pair.Window is null ? null : await ReadLatestAsync(session, new MySqlPairSql(target, null), at, ct);
        }, cancellationToken);
    }

    public void Dispose() => _gate.Dispose();

    private async Task<T> InSessionAsync<T>(PairConfig pair, Func<Session, PairTarget, CancellationToken, Task<T>> work, CancellationToken cancellationToken)
    {
        PairTarget target;
        try
        {
            target = PairTarget.From(pair, SqlIdentifier.Backtick);
            _ = target.Table?.Backticked;
        }
        catch (ArgumentException e)
        {
            throw new SourceException(SourceFailure.QueryError, $"Pair '{pair.Name}': {e.Message.Split(" (Parameter", 2)[0]}", e);
        }

        var subject = $"Pair '{pair.Name}' (source '{Config.Name}', {target.Describe})";
        await _gate.WaitAsync(cancellationToken);
        MySqlConnection? connection = null;
        try
        {
            connection = new MySqlConnection(_connectionString);
            bool backslashEscapes;
            try
            {
                await connection.OpenAsync(cancellationToken);
                backslashEscapes = await BeginAsync(connection, Config.StatementTimeout, cancellationToken);
            }
            catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
            {
                throw MySqlErrors.Map(e, subject, _endpoint, opening: true);
            }

            try
            {
                foreach (var text in new[] { target.Where, target.Query })
                {
                    if (text is not null && MySqlConfiguredSql.Problem(text, backslashEscapes) is { } problem)
                    {
                        throw new SourceException(SourceFailure.QueryError, $"{subject}: the configured SQL is refused: {problem}.");
                    }
                }

                var result = await work(new Session(connection, subject), target, cancellationToken);
                await using var rollback = new MySqlCommand("ROLLBACK", connection);
                await rollback.ExecuteNonQueryAsync(cancellationToken);
                return result;
            }
            catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
            {
                await EndQuietlyAsync(connection);
                throw MySqlErrors.Map(e, subject, _endpoint, opening: false);
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
    /// Ends a failed check's transaction before the connection goes back to the pool: MySqlConnector resets a
    /// pooled session only when it is next taken, and until then an open transaction would keep its metadata
    /// locks, blocking DDL on the watched tables. A connection that cannot even roll back is dropped from the pool.
    /// </summary>
    private static async Task EndQuietlyAsync(MySqlConnection connection)
    {
        try
        {
            await using var rollback = new MySqlCommand("ROLLBACK", connection);
            await rollback.ExecuteNonQueryAsync(CancellationToken.None);
        }
        catch (Exception e) when (e is MySqlException or InvalidOperationException or IOException)
        {
            MySqlConnection.ClearPool(connection);
        }
    }

    /// <summary>UTC, the statement timeout, then the read-only snapshot. Returns whether backslashes escape quotes in this session's sql_mode.</summary>
    private static async Task<bool> BeginAsync(MySqlConnection connection, TimeSpan timeout, CancellationToken ct)
    {
        var mariaDb = connection.ServerVersion.Contains("MariaDB", StringComparison.OrdinalIgnoreCase);
        var seconds = timeout <= TimeSpan.Zero ? 0 : timeout.TotalSeconds;
        var limit = mariaDb
            ? "max_statement_time = " + seconds.ToString("0.###", CultureInfo.InvariantCulture)
            : "max_execution_time = " + ((long)Math.Ceiling(seconds * 1000)).ToString(CultureInfo.InvariantCulture);
        await using var command = new MySqlCommand(
            $"SET SESSION time_zone = '+00:00', SESSION {limit}; SET TRANSACTION ISOLATION LEVEL REPEATABLE READ; START TRANSACTION WITH CONSISTENT SNAPSHOT, READ ONLY; SELECT @@SESSION.sql_mode",
            connection);
        var mode = Convert.ToString(await command.ExecuteScalarAsync(ct), CultureInfo.InvariantCulture) ?? string.Empty;
        return !mode.Contains("NO_BACKSLASH_ESCAPES", StringComparison.OrdinalIgnoreCase);
    }

    /// <summary>Checks the columns' types; the SQL over the window of a check at <paramref name="at"/> (none when null) and where that window ends.</summary>
    private static async Task<(MySqlPairSql Sql, DateTimeOffset? WindowEnd)> CheckColumnsAsync(Session session, PairConfig pair, PairTarget target, DateTimeOffset? at, CancellationToken ct)
    {
        var probe = new MySqlPairSql(target, null).Probe();
        await using (var command = session.Command(probe, new NamedParameters('@')))
        await using (var reader = await command.ExecuteReaderAsync(CommandBehavior.SchemaOnly, ct))
        {
            var columns = await reader.GetColumnSchemaAsync(ct);
            string[] names = pair.Window is null ? [pair.X, pair.Y] : [pair.X, pair.Y, pair.Window.Column];
            for (var i = 0; i < names.Length && i < columns.Count; i++)
            {
                var column = (MySqlDbColumn)columns[i];
                var isWindow = i == 2;
                var ok = isWindow ? TimeTypes.Contains(column.ProviderType) : NumericTypes.Contains(column.ProviderType);
                if (!ok)
                {
                    var type = column.DataTypeName ?? column.ProviderType.ToString();
                    throw isWindow
                        ? new SourceException(SourceFailure.QueryError, $"{session.Subject}: window column {names[i]} is {type}; it must be a DATE, DATETIME or TIMESTAMP.")
                        : new SourceException(SourceFailure.NonNumericColumn, $"{session.Subject}: column {names[i]} is {type}, not a number.");
                }
            }
        }

        WindowRange? range = null;
        DateTimeOffset? end = null;
        if (pair.Window is { } window && at is { } t)
        {
            end = window.Anchor == WindowAnchor.Latest ? await ReadLatestAsync(session, new MySqlPairSql(target, null), t, ct) : t;
            // No value at or before t: the window ending at t is just as empty, and the run says so (unmeasurable).
            range = end is { } newest && window.Anchor == WindowAnchor.Latest ? WindowRange.Through(window, newest) : WindowRange.EndingAt(window, t);
        }

        return (new MySqlPairSql(target, range), end);
    }

    private static async Task<DateTimeOffset?> ReadLatestAsync(Session session, MySqlPairSql sql, DateTimeOffset at, CancellationToken ct)
    {
        var (text, parameters) = sql.Latest(at);
        await using var command = session.Command(text, parameters);
        await using var reader = await command.ExecuteReaderAsync(ct);
        return await reader.ReadAsync(ct) && !reader.IsDBNull(0)
            ? new DateTimeOffset(DateTime.SpecifyKind(reader.GetDateTime(0), DateTimeKind.Utc))
            : null;
    }

    /// <summary>The centred two-pass figures; again on rescaled values when a sum overflows DOUBLE (error 1690) or cannot be trusted.</summary>
    private static async Task<SourceFigures> ReadFiguresAsync(Session session, MySqlPairSql sql, CancellationToken ct)
    {
        try
        {
            var figures = await ReadAggregateAsync(session, sql.Aggregate(), ct);
            if (!Rescaling.Needed(figures))
            {
                return figures;
            }
        }
        catch (MySqlException e) when (e.ErrorCode == MySqlErrorCode.DataOutOfRange)
        {
            // Falls through to the rescaled form; the transaction stays usable after a failed SELECT.
        }

        var (text, parameters) = sql.Range();
        Rescaling rescaling;
        await using (var command = session.Command(text, parameters))
        await using (var reader = await command.ExecuteReaderAsync(ct))
        {
            await reader.ReadAsync(ct);
            double? Get(int i) => reader.IsDBNull(i) ? null : reader.GetDouble(i);
            rescaling = Rescaling.For(Get(0), Get(1), Get(2), Get(3));
        }

        return rescaling.Restore(await ReadAggregateAsync(session, sql.Aggregate(rescaling), ct));
    }

    private static async Task<SourceFigures> ReadAggregateAsync(Session session, (string Sql, NamedParameters Parameters) aggregate, CancellationToken ct)
    {
        await using var command = session.Command(aggregate.Sql, aggregate.Parameters);
        await using var reader = await command.ExecuteReaderAsync(ct);
        await reader.ReadAsync(ct);
        double? Get(int i) => reader.IsDBNull(i) ? null : reader.GetDouble(i);
        var n = Convert.ToInt64(reader.GetValue(2), CultureInfo.InvariantCulture);
        var (mx, my, sxx, syy, sxy) = (Get(3), Get(4), Get(5), Get(6), Get(7));
        double? slope = sxx is > 0 && sxy is { } p ? p / sxx : null;
        // √Sxx·√Syy rather than √(Sxx·Syy): the product overflows long before either sum does.
        double? r = sxx is > 0 && syy is > 0 && sxy is { } q ? Math.Clamp(q / (Math.Sqrt(sxx.Value) * Math.Sqrt(syy.Value)), -1.0, 1.0) : null;
        return new SourceFigures(
            Convert.ToInt64(reader.GetValue(0), CultureInfo.InvariantCulture),
            n,
            Convert.ToInt64(reader.GetValue(1), CultureInfo.InvariantCulture),
            r,
            slope,
            slope is { } b && my is { } ym && mx is { } xm ? ym - (b * xm) : null,
            n > 0 ? mx : null,
            n > 0 ? my : null,
            n >= 2 && sxx is { } vx ? vx / (n - 1) : null,
            n >= 2 && syy is { } vy ? vy / (n - 1) : null);
    }

    private static string Describe(SamplePlan plan, SampleSpec spec, long windowRows, PairedSample sample)
    {
        var rows = sample.RowCount.ToString(CultureInfo.InvariantCulture);
        var text = plan.Draw == SampleDraw.All
            ? $"all {rows}"
            : $"random filter {SamplePlanner.FormatPercent(100 * MySqlPairSql.KeepProbability(spec.Rows, windowRows))}% {rows}";
        if (spec.Seed is { } seed && plan.Draw != SampleDraw.All)
        {
            text += " seed " + seed.ToString(CultureInfo.InvariantCulture);
        }

        return plan.Note is null ? text : $"{text} ({plan.Note})";
    }

    private sealed class Session(MySqlConnection connection, string subject)
    {
        public string Subject { get; } = subject;

        public MySqlCommand Command(string sql, NamedParameters parameters)
        {
            var command = new MySqlCommand(sql, connection);
            parameters.BindTo(command, (name, value) => new MySqlParameter(name, value));
            return command;
        }
    }
}
