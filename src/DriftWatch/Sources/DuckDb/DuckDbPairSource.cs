using System.Data.Common;
using System.Globalization;
using System.Text.Json;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DuckDB.NET.Data;

namespace DriftWatch.Sources.DuckDb;

/// <summary>
/// Reads pairs from DuckDB in-process: tables of a database file opened with ACCESS_MODE=READ_ONLY, or
/// Parquet/CSV files by path or glob (an in-memory database then only reads them). Every command that carries
/// configured text is first parse-checked by DuckDB itself (<c>json_serialize_sql</c>, which accepts
/// SELECT statements only) to be exactly one SELECT, so a filter cannot smuggle in a COPY … TO or a second
/// statement. Figures are DuckDB's own aggregates; samples are DuckDB's reservoir sampling. DuckDB has no
/// statement timeout: a statement that runs longer than the source's is interrupted.
/// </summary>
internal sealed class DuckDbPairSource : IPairSource, IDisposable
{
    internal static readonly HashSet<string> NumericTypes =
        ["TINYINT", "SMALLINT", "INTEGER", "BIGINT", "HUGEINT", "UTINYINT", "USMALLINT", "UINTEGER", "UBIGINT", "UHUGEINT", "FLOAT", "DOUBLE"];

    private static readonly HashSet<string> TimeTypes =
        ["DATE", "TIMESTAMP", "TIMESTAMP WITH TIME ZONE", "TIMESTAMP_S", "TIMESTAMP_MS", "TIMESTAMP_NS"];

    private readonly string _connectionString;
    private readonly string _database;
    private readonly SemaphoreSlim _gate;

    public DuckDbPairSource(SourceConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        Config = config;
        (_connectionString, _database) = ConnectionFor(config);
        _gate = new SemaphoreSlim(Math.Max(1, config.MaxConcurrentQueries));
    }

    public SourceConfig Config { get; }

    /// <summary>The connection string (database files read-only, no extension fetched) and how messages name the database.</summary>
    internal static (string ConnectionString, string Database) ConnectionFor(SourceConfig config)
    {
        var builder = new DbConnectionStringBuilder { ConnectionString = config.ConnectionString };
        var key = builder.Keys.Cast<string>().FirstOrDefault(k => k.Replace(" ", string.Empty, StringComparison.Ordinal).Equals("DataSource", StringComparison.OrdinalIgnoreCase));
        var dataSource = key is null ? string.Empty : Convert.ToString(builder[key], CultureInfo.InvariantCulture) ?? string.Empty;
        if (key is not null)
        {
            builder.Remove(key);
        }

        var memory = dataSource.Length == 0 || dataSource == ":memory:";
        var database = memory ? "(files only)" : dataSource;
        builder["DataSource"] = memory ? ":memory:" : dataSource;
        if (!memory)
        {
            builder["ACCESS_MODE"] = "READ_ONLY";
        }

        // Never fetch an extension from the network: what is not built in fails at once.
        builder["autoinstall_known_extensions"] = "false";
        return (builder.ConnectionString, database);
    }

    public Task<SampledPair> SampleAsync(PairConfig pair, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        return InSessionAsync(pair, (session, target, from) =>
        {
            var (sql, windowEnd) = CheckColumns(session, pair, target, now);
            var figures = ReadFigures(session, sql);
            var isTable = target.IsTable || DuckDbTarget.IsFile(pair.Table);
            // A reservoir over the window is one pass whatever the table's size, so auto never needs table sampling.
            double? tableRows = isTable && pair.Sample.Method == SampleMethod.Tablesample ? figures.RowCount : null;
            var plan = SamplePlanner.Choose(pair.Sample, figures.RowCount, tableRows, filtered: true);
            var (text, parameters) = sql.Sample(plan, pair.Sample.Rows, pair.Sample.Seed, pair.Sample.Bernoulli);
            using var command = session.Command(text, parameters);
            using var reader = command.ExecuteReader();
            var builder = new PairedSampleBuilder(plan.Draw == SampleDraw.All ? 0 : pair.Sample.Rows);
            while (reader.Read())
            {
                builder.Add(reader.IsDBNull(0) ? null : reader.GetDouble(0), reader.IsDBNull(1) ? null : reader.GetDouble(1));
            }

            var sample = builder.Build();
            return new SampledPair(sample, figures, Describe(plan, pair.Sample, sample)) { WindowEnd = windowEnd };
        }, cancellationToken);
    }

    public Task<IReadOnlyList<DrivingRow>> FarthestFromLineAsync(
        PairConfig pair, DateTimeOffset now, double intercept, double slope, int count, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        LineDistance.CheckCount(count);
        var line = LineDistance.For(intercept, slope);
        return InSessionAsync(pair, (session, target, from) =>
        {
            var (sql, _) = CheckColumns(session, pair, target, now);
            var (text, parameters) = sql.Farthest(line, count);
            using var command = session.Command(text, parameters);
            using var reader = command.ExecuteReader();
            var rows = new List<DrivingRow>(count);
            while (reader.Read())
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
        return InSessionAsync(pair, (session, target, from) =>
        {
            CheckColumns(session, pair, target, null);
            return true;
        }, cancellationToken);
    }

    public Task<DateTimeOffset?> LatestAsync(PairConfig pair, DateTimeOffset at, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        return InSessionAsync(pair, (session, target, from) =>
        {
            CheckColumns(session, pair, target, null);
            return pair.Window is null ? null : ReadLatest(session, new DuckDbPairSql(target, session.From, null), at);
        }, cancellationToken);
    }

    public void Dispose() => _gate.Dispose();

    /// <summary>The pair's target with the files (if any) as a FROM item, relative paths resolved against the configuration's directory.</summary>
    private (PairTarget Target, string From) Resolve(PairConfig pair)
    {
        if (DuckDbTarget.IsFile(pair.Table))
        {
            var path = pair.Table!.Trim();
            if (!Path.IsPathRooted(path) && Config.BaseDirectory is { } baseDirectory)
            {
                path = Path.Combine(baseDirectory, path);
            }

            var scan = DuckDbTarget.FileScan(path);
            var target = PairTarget.From(pair with { Table = null, Query = "SELECT 1" }) with { Query = null };
            return (target, scan);
        }

        var plain = PairTarget.From(pair);
        return (plain, plain.Table is { } table ? table.Quoted : $"({plain.Query}) AS q");
    }

    private async Task<T> InSessionAsync<T>(PairConfig pair, Func<Session, PairTarget, string, T> work, CancellationToken cancellationToken)
    {
        PairTarget target;
        string from;
        try
        {
            (target, from) = Resolve(pair);
        }
        catch (ArgumentException e)
        {
            throw new SourceException(SourceFailure.QueryError, $"Pair '{pair.Name}': {e.Message.Split(" (Parameter", 2)[0]}", e);
        }

        var describe = DuckDbTarget.IsFile(pair.Table) ? $"files {pair.Table!.Trim()}" : target.Describe;
        // Query pairs name their columns through the subquery's alias.
        if (!target.IsTable && !DuckDbTarget.IsFile(pair.Table))
        {
            target = target with { X = "q." + target.X, Y = "q." + target.Y, WindowColumn = target.WindowColumn is null ? null : "q." + target.WindowColumn };
        }

        await _gate.WaitAsync(cancellationToken);
        try
        {
            // DuckDB.NET runs synchronously; keep the scheduler's thread free.
            return await Task.Run(() =>
            {
                var subject = $"Pair '{pair.Name}' (source '{Config.Name}', {describe})";
                using var session = new Session(subject, Config.StatementTimeout, cancellationToken) { From = from };
                try
                {
                    session.Open(_connectionString);
                }
                catch (Exception e) when (e is not OperationCanceledException)
                {
                    throw DuckDbErrors.Map(e, subject, _database, opening: true, timedOut: false);
                }

                try
                {
                    return work(session, target, from);
                }
                catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
                {
                    // An interrupted statement surfaces as OperationCanceledException: ours when the timeout fired.
                    throw DuckDbErrors.Map(e, subject, _database, opening: false, session.TimedOut);
                }
            }, cancellationToken);
        }
        finally
        {
            _gate.Release();
        }
    }

    /// <summary>Checks the columns' types; the SQL over the window of a check at <paramref name="at"/> (none when null) and where that window ends.</summary>
    private static (DuckDbPairSql Sql, DateTimeOffset? WindowEnd) CheckColumns(Session session, PairConfig pair, PairTarget target, DateTimeOffset? at)
    {
        var probe = new DuckDbPairSql(target, session.From, null).Probe();
        session.RequireSingleSelect(probe);
        var types = new List<string>();
        using (var command = session.Command("DESCRIBE " + probe, new NamedParameters('$')))
        using (var reader = command.ExecuteReader())
        {
            while (reader.Read())
            {
                types.Add(reader.GetString(1));
            }
        }

        string[] names = pair.Window is null ? [pair.X, pair.Y] : [pair.X, pair.Y, pair.Window.Column];
        for (var i = 0; i < names.Length && i < types.Count; i++)
        {
            var type = types[i];
            var isWindow = i == 2;
            var ok = isWindow ? TimeTypes.Contains(type) : NumericTypes.Contains(type) || type.StartsWith("DECIMAL", StringComparison.Ordinal);
            if (!ok)
            {
                throw isWindow
                    ? new SourceException(SourceFailure.QueryError, $"{session.Subject}: window column {names[i]} is {type}; it must be a DATE or TIMESTAMP.")
                    : new SourceException(SourceFailure.NonNumericColumn, $"{session.Subject}: column {names[i]} is {type}, not a number.");
            }
        }

        WindowRange? range = null;
        DateTimeOffset? end = null;
        if (pair.Window is { } window && at is { } t)
        {
            end = window.Anchor == WindowAnchor.Latest ? ReadLatest(session, new DuckDbPairSql(target, session.From, null), t) : t;
            // No value at or before t: the window ending at t is just as empty, and the run says so (unmeasurable).
            range = end is { } newest && window.Anchor == WindowAnchor.Latest ? WindowRange.Through(window, newest) : WindowRange.EndingAt(window, t);
        }

        return (new DuckDbPairSql(target, session.From, range), end);
    }

    private static DateTimeOffset? ReadLatest(Session session, DuckDbPairSql sql, DateTimeOffset at)
    {
        var (text, parameters) = sql.Latest(at);
        using var command = session.Command(text, parameters);
        using var reader = command.ExecuteReader();
        return reader.Read() && !reader.IsDBNull(0)
            ? new DateTimeOffset(DateTime.SpecifyKind(reader.GetDateTime(0), DateTimeKind.Utc))
            : null;
    }

    /// <summary>
    /// DuckDB's own corr, regr_slope, regr_intercept, avg and var_samp over the window; computed again on
    /// rescaled values when they overflow (values near 1e300) or cannot be trusted (<see cref="Rescaling.Needed"/>).
    /// </summary>
    private static SourceFigures ReadFigures(Session session, DuckDbPairSql sql)
    {
        try
        {
            var (figures, finite) = ReadAggregate(session, sql.Aggregate());
            if (finite && !Rescaling.Needed(figures))
            {
                return figures;
            }
        }
        catch (DuckDBException e) when (e.ErrorType == DuckDB.NET.Native.DuckDBErrorType.OutOfRange)
        {
            // Falls through to the rescaled form.
        }

        var (text, parameters) = sql.Range();
        Rescaling rescaling;
        using (var command = session.Command(text, parameters))
        using (var reader = command.ExecuteReader())
        {
            reader.Read();
            rescaling = Rescaling.For(Finite(reader, 0), Finite(reader, 1), Finite(reader, 2), Finite(reader, 3));
        }

        return rescaling.Restore(ReadAggregate(session, sql.Aggregate(rescaling)).Figures);
    }

    private static (SourceFigures Figures, bool Finite) ReadAggregate(Session session, (string Sql, NamedParameters Parameters) aggregate)
    {
        using var command = session.Command(aggregate.Sql, aggregate.Parameters);
        using var reader = command.ExecuteReader();
        reader.Read();
        var used = Convert.ToInt64(reader.GetValue(2), CultureInfo.InvariantCulture);
        // An aggregate that overflowed inside comes back as ±Infinity or NaN instead of failing.
        var finite = Enumerable.Range(3, 7).All(i => reader.IsDBNull(i) || double.IsFinite(reader.GetDouble(i)));
        var figures = new SourceFigures(
            Convert.ToInt64(reader.GetValue(0), CultureInfo.InvariantCulture),
            used,
            Convert.ToInt64(reader.GetValue(1), CultureInfo.InvariantCulture),
            Finite(reader, 3),
            Finite(reader, 4),
            Finite(reader, 5),
            Finite(reader, 6),
            Finite(reader, 7),
            Finite(reader, 8),
            Finite(reader, 9));
        return (figures, finite || used == 0);
    }

    private static double? Finite(DbDataReader reader, int ordinal) =>
        reader.IsDBNull(ordinal) ? null : reader.GetDouble(ordinal) is var v && double.IsFinite(v) ? v : null;

    private static string Describe(SamplePlan plan, SampleSpec spec, PairedSample sample)
    {
        var rows = sample.RowCount.ToString(CultureInfo.InvariantCulture);
        var text = plan.Draw switch
        {
            SampleDraw.All => $"all {rows}",
            SampleDraw.Random => $"reservoir {rows}",
            _ => $"tablesample {(spec.Bernoulli ? "bernoulli" : "system")} {SamplePlanner.FormatPercent(plan.Percent!.Value)}% reservoir {rows}",
        };
        if (spec.Seed is { } seed && plan.Draw != SampleDraw.All)
        {
            text += " seed " + seed.ToString(CultureInfo.InvariantCulture);
        }

        return plan.Note is null ? text : $"{text} ({plan.Note})";
    }

    /// <summary>One connection, the statement timeout (an interrupt of the running command) and the single-SELECT check.</summary>
    internal sealed class Session(string subject, TimeSpan timeout, CancellationToken cancellationToken) : IDisposable
    {
        private DuckDBConnection? _connection;
        private CancellationTokenSource? _timer;
        private CancellationTokenRegistration _registration;

        public string Subject { get; } = subject;

        public bool TimedOut { get; private set; }

        /// <summary>Set by the pair source before the work: the FROM item (kept here so CheckColumns can build SQL).</summary>
        public string From { get; set; } = string.Empty;

        public void Open(string connectionString)
        {
            _connection = new DuckDBConnection(connectionString);
            _connection.Open();
            using var command = _connection.CreateCommand();
            // UTC so TIMESTAMP WITH TIME ZONE windows compare with the UTC bounds as instants.
            command.CommandText = "SET TimeZone = 'UTC'";
            command.ExecuteNonQuery();
        }

        /// <summary>DuckDB's parser decides: json_serialize_sql serialises SELECT statements only and lists each statement.</summary>
        public void RequireSingleSelect(string sql)
        {
            using var command = _connection!.CreateCommand();
            // The function takes a constant only: a standard string literal, whose one escape is a doubled quote.
            command.CommandText = "SELECT json_serialize_sql('" + sql.Replace("'", "''", StringComparison.Ordinal) + "')";
            var json = Convert.ToString(command.ExecuteScalar(), CultureInfo.InvariantCulture) ?? "{}";
            using var document = JsonDocument.Parse(json);
            var root = document.RootElement;
            var error = root.TryGetProperty("error", out var e) && e.ValueKind == JsonValueKind.True;
            var statements = root.TryGetProperty("statements", out var s) && s.ValueKind == JsonValueKind.Array ? s.GetArrayLength() : 0;
            if (error || statements != 1)
            {
                var reason = root.TryGetProperty("error_message", out var m) ? m.GetString() : null;
                throw new SourceException(SourceFailure.QueryError, error && reason is not null && !reason.Contains("Only SELECT", StringComparison.OrdinalIgnoreCase)
                    ? $"{Subject}: the configured SQL does not parse: {reason}."
                    : $"{Subject}: the configured SQL must be part of a single SELECT; a filter or query cannot hold another statement.");
            }
        }

        public DuckDBCommand Command(string sql, NamedParameters parameters)
        {
            Arm();
            var command = _connection!.CreateCommand();
            command.CommandText = sql;
            parameters.BindTo(command, (name, value) => new DuckDBParameter(name, value));
            _registration = _timer!.Token.Register(() =>
            {
                TimedOut = !cancellationToken.IsCancellationRequested;
                command.Cancel();
            });
            return command;
        }

        public void Dispose()
        {
            _registration.Dispose();
            _timer?.Dispose();
            _connection?.Dispose();
        }

        private void Arm()
        {
            _registration.Dispose();
            _timer?.Dispose();
            _timer = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
            if (timeout > TimeSpan.Zero)
            {
                _timer.CancelAfter(timeout);
            }
        }
    }
}
