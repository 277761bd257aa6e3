using System.Globalization;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using Microsoft.Data.Sqlite;
using SQLitePCL;

namespace DriftWatch.Sources.Sqlite;

/// <summary>
/// Reads pairs from a SQLite file opened with Mode=ReadOnly and <c>PRAGMA query_only</c>; every command that
/// carries configured SQL must be a single statement. SQLite has no statement timeout, so one is enforced by
/// interrupting the connection (sqlite3_interrupt). Push-down figures are computed by SQL with a two-pass,
/// centred formula; table sampling does not exist here, so large windows are sampled with
/// <c>ORDER BY random() LIMIT n</c>, or with a seeded reservoir in the process when the pair sets a seed.
/// Values must be stored as integers or reals: text values are counted as non-numeric, and a column with
/// text affinity or with text only is rejected.
/// </summary>
internal sealed class SqlitePairSource : IPairSource, IDisposable
{
    private readonly string _connectionString;
    private readonly string _file;
    private readonly SemaphoreSlim _gate;

    public SqlitePairSource(SourceConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        Config = config;
        var builder = new SqliteConnectionStringBuilder(config.ConnectionString)
        {
            Mode = SqliteOpenMode.ReadOnly,
            Pooling = false,
        };
        _file = builder.DataSource;
        _connectionString = builder.ToString();
        _gate = new SemaphoreSlim(Math.Max(1, config.MaxConcurrentQueries));
    }

    public SourceConfig Config { get; }

    public Task<SampledPair> SampleAsync(PairConfig pair, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var target = PairTarget.From(pair);
        return InSessionAsync(pair, target, session =>
        {
            CheckColumns(session, pair, target);
            var window = pair.Window is null ? null : ResolveWindow(session, target, pair.Window, now);
            if (pair.Window is not null && window is null)
            {
                // No row has a time at all: the window is empty.
                return new SampledPair(PairedSample.Empty, new SourceFigures(0, 0, 0, null, null, null, null, null, null, null), "all 0")
                {
                    WindowEnd = pair.Window.Anchor == WindowAnchor.Now ? now : null,
                };
            }

            var sql = new SqlitePairSql(target, window is not null, window?.EndInclusive ?? false);
            var figures = ReadFigures(session, sql, window);
            var plan = SamplePlanner.Choose(pair.Sample, figures.RowCount, tableRows: null, filtered: true);
            var (sample, method) = ReadSample(session, sql, window, plan, pair, target);
            return new SampledPair(sample, figures, method) { WindowEnd = window?.End };
        }, cancellationToken);
    }

    public Task<IReadOnlyList<DrivingRow>> FarthestFromLineAsync(
        PairConfig pair, DateTimeOffset now, double intercept, double slope, int count, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        LineDistance.CheckCount(count);
        var line = LineDistance.For(intercept, slope);
        var target = PairTarget.From(pair);
        return InSessionAsync(pair, target, session =>
        {
            CheckColumns(session, pair, target);
            var window = pair.Window is null ? null : ResolveWindow(session, target, pair.Window, now);
            var rows = new List<DrivingRow>(count);
            if (pair.Window is not null && window is null)
            {
                return (IReadOnlyList<DrivingRow>)rows;
            }

            using var command = session.Command(new SqlitePairSql(target, window is not null, window?.EndInclusive ?? false).Farthest(), checkSingle: true);
            Bind(command, window, null);
            command.Parameters.AddWithValue("@f", line.Factor);
            command.Parameters.AddWithValue("@a", line.ScaledIntercept);
            command.Parameters.AddWithValue("@b", line.ScaledSlope);
            command.Parameters.AddWithValue("@yfloor", line.YFloor);
            command.Parameters.AddWithValue("@xfloor", line.XFloor);
            command.Parameters.AddWithValue("@count", count);
            using var reader = command.ExecuteReader();
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
        var target = PairTarget.From(pair);
        return InSessionAsync(pair, target, session =>
        {
            CheckColumns(session, pair, target);
            var sql = new SqlitePairSql(target, windowed: false);
            // Reads a few rows so a query's text-only column is caught too.
            using var command = session.Command(sql.All() + " LIMIT 20", checkSingle: true);
            using var reader = command.ExecuteReader();
            ReadRows(reader, pair, target, out _);
            return true;
        }, cancellationToken);
    }

    public void Dispose() => _gate.Dispose();

    private async Task<T> InSessionAsync<T>(PairConfig pair, PairTarget target, Func<Session, T> work, CancellationToken cancellationToken)
    {
        await _gate.WaitAsync(cancellationToken);
        try
        {
            // Microsoft.Data.Sqlite runs synchronously; keep the scheduler's thread free.
            return await Task.Run(() =>
            {
                using var connection = new SqliteConnection(_connectionString);
                using var session = new Session(connection, $"Pair '{pair.Name}' (source '{Config.Name}', {target.Describe})", Config.StatementTimeout, cancellationToken);
                try
                {
                    connection.Open();
                    using (var pragma = connection.CreateCommand())
                    {
                        var busyMs = (long)Math.Clamp(Config.StatementTimeout.TotalMilliseconds, 0, int.MaxValue);
                        pragma.CommandText = "PRAGMA query_only = ON; PRAGMA busy_timeout = " + busyMs.ToString(CultureInfo.InvariantCulture) + ";";
                        pragma.ExecuteNonQuery();
                    }

                    return work(session);
                }
                catch (Exception e) when (e is not OperationCanceledException)
                {
                    cancellationToken.ThrowIfCancellationRequested();
                    throw SqliteErrors.Map(e, pair.Name, Config.Name, _file, target.Describe, session.TimedOut);
                }
            }, cancellationToken);
        }
        finally
        {
            _gate.Release();
        }
    }

    private static void CheckColumns(Session session, PairConfig pair, PairTarget target)
    {
        if (target.Table is { } table)
        {
            using var info = session.Command(table.Schema is null
                ? "SELECT name, type FROM pragma_table_info(@t)"
                : "SELECT name, type FROM pragma_table_info(@t, @s)", checkSingle: false);
            info.Parameters.AddWithValue("@t", table.Name);
            if (table.Schema is not null)
            {
                info.Parameters.AddWithValue("@s", table.Schema);
            }

            var columns = new List<(string Name, string Type)>();
            using (var reader = info.ExecuteReader())
            {
                while (reader.Read())
                {
                    columns.Add((reader.GetString(0), reader.IsDBNull(1) ? string.Empty : reader.GetString(1)));
                }
            }

            if (columns.Count == 0)
            {
                throw new SourceException(SourceFailure.MissingTable, $"Pair '{pair.Name}': no table or view {table} in the SQLite database.");
            }

            foreach (var (name, numeric) in new[] { (pair.X, true), (pair.Y, true) }.Concat(pair.Window is null ? [] : [(pair.Window.Column, false)]))
            {
                // SQLite matches ASCII identifiers case-insensitively.
                var found = columns.FirstOrDefault(c => string.Equals(c.Name, name, StringComparison.OrdinalIgnoreCase));
                if (found.Name is null)
                {
                    throw new SourceException(SourceFailure.MissingColumn, $"Pair '{pair.Name}' ({target.Describe}): no column {name}; it has {string.Join(", ", columns.Select(c => c.Name))}.");
                }

                if (numeric && SqliteAffinityRules.Of(found.Type) == SqliteAffinity.Text)
                {
                    throw new SourceException(SourceFailure.NonNumericColumn, $"Pair '{pair.Name}' ({target.Describe}): column {name} is declared {found.Type}, a text type, not a number.");
                }
            }
        }

        // Resolves the query, the columns and the filter without reading a row.
        using var probe = session.Command(new SqlitePairSql(target, windowed: false).Probe(), checkSingle: true);
        using var probeReader = probe.ExecuteReader();
    }

    public Task<DateTimeOffset?> LatestAsync(PairConfig pair, DateTimeOffset at, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var target = PairTarget.From(pair);
        return InSessionAsync(pair, target, session =>
        {
            CheckColumns(session, pair, target);
            return pair.Window is null ? null : ResolveWindow(session, target, pair.Window with { Anchor = WindowAnchor.Latest }, at)?.End;
        }, cancellationToken);
    }

    /// <summary>
    /// The window of a check at <paramref name="at"/> in the column's own form; null when no row has a time at all.
    /// Anchor latest without a value at or before <paramref name="at"/> gives the window ending at it (just as empty), with no end.
    /// </summary>
    private static SqliteWindow? ResolveWindow(Session session, PairTarget target, WindowSpec spec, DateTimeOffset at)
    {
        string storageClass;
        string? first;
        using (var command = session.Command(new SqlitePairSql(target, windowed: false).WindowProbe(), checkSingle: true))
        using (var reader = command.ExecuteReader())
        {
            if (!reader.Read())
            {
                return null;
            }

            storageClass = reader.GetString(0);
            first = reader.IsDBNull(1) ? null : reader.GetString(1);
        }

        var ending = SqliteWindow.For(storageClass, first, at - spec.Last, at);
        if (spec.Anchor == WindowAnchor.Now)
        {
            return ending;
        }

        using var latest = session.Command(new SqlitePairSql(target, windowed: false).Latest(), checkSingle: true);
        latest.Parameters.AddWithValue("@at", ending.To);
        var newest = latest.ExecuteScalar();
        return newest is null or DBNull ? ending with { End = null } : SqliteWindow.Through(storageClass, first, newest, spec.Last);
    }

    /// <summary>
    /// The push-down figures; when the sums come out infinite (values near 1e300, whose squares exceed
    /// float64) or the spread is tiny against the magnitude (<see cref="Rescaling.Needed"/>), they are computed
    /// again on rescaled values, after one more scan for the columns' ranges. The common case stays one statement.
    /// </summary>
    private static SourceFigures ReadFigures(Session session, SqlitePairSql sql, SqliteWindow? window)
    {
        var (figures, overflowed) = ReadAggregate(session, sql, window, null);
        if (!overflowed && !Rescaling.Needed(figures))
        {
            return figures;
        }

        Rescaling rescaling;
        using (var command = session.Command(sql.Range(), checkSingle: true))
        {
            Bind(command, window, null);
            using var reader = command.ExecuteReader();
            reader.Read();
            double? Get(int i) => reader.IsDBNull(i) ? null : reader.GetDouble(i);
            rescaling = Rescaling.For(Get(0), Get(1), Get(2), Get(3));
        }

        return rescaling.Restore(ReadAggregate(session, sql, window, rescaling).Figures);
    }

    private static (SourceFigures Figures, bool Overflowed) ReadAggregate(Session session, SqlitePairSql sql, SqliteWindow? window, Rescaling? rescaling)
    {
        using var command = session.Command(sql.Aggregate(rescaled: rescaling is not null), checkSingle: true);
        Bind(command, window, null);
        if (rescaling is not null)
        {
            command.Parameters.AddWithValue("@fx", rescaling.XFactor);
            command.Parameters.AddWithValue("@fy", rescaling.YFactor);
            command.Parameters.AddWithValue("@sx", rescaling.XShift);
            command.Parameters.AddWithValue("@sy", rescaling.YShift);
        }

        using var reader = command.ExecuteReader();
        reader.Read();
        var n = reader.GetInt64(2);
        double? Get(int i) => reader.IsDBNull(i) ? null : reader.GetDouble(i);
        var (mx, my, sxx, syy, sxy) = (Get(3), Get(4), Get(5), Get(6), Get(7));
        // SQLite turns an overflowing sum into Infinity and an Infinity − Infinity into NULL.
        bool overflowed = n > 0 && new[] { mx, my, sxx, syy, sxy }.Any(v => v is not { } d || !double.IsFinite(d));
        double? slope = sxx is > 0 && sxy is { } p ? p / sxx : null;
        // √Sxx·√Syy rather than √(Sxx·Syy): the product overflows long before either sum does.
        double? r = sxx is > 0 && syy is > 0 && sxy is { } q ? Math.Clamp(q / (Math.Sqrt(sxx.Value) * Math.Sqrt(syy.Value)), -1.0, 1.0) : null;
        var figures = new SourceFigures(
            reader.GetInt64(0),
            n,
            reader.GetInt64(1),
            r,
            slope,
            slope is { } b && my is { } ym && mx is { } xm ? ym - (b * xm) : null,
            mx,
            my,
            n >= 2 && sxx is { } vx ? vx / (n - 1) : null,
            n >= 2 && syy is { } vy ? vy / (n - 1) : null);
        return (figures, overflowed);
    }

    private static (PairedSample Sample, string Method) ReadSample(Session session, SqlitePairSql sql, SqliteWindow? window, SamplePlan plan, PairConfig pair, PairTarget target)
    {
        var spec = pair.Sample;
        var seeded = plan.Draw != SampleDraw.All && spec.Seed is not null;
        var text = plan.Draw == SampleDraw.All || seeded ? sql.All() : sql.Random();
        using var command = session.Command(text, checkSingle: true);
        Bind(command, window, seeded ? null : spec.Rows);
        using var reader = command.ExecuteReader();
        PairedSample sample;
        string method;
        if (seeded)
        {
            sample = ReadRowsSeeded(reader, pair, target, spec.Rows, spec.Seed!.Value);
            method = $"reservoir {sample.RowCount.ToString(CultureInfo.InvariantCulture)} seed {spec.Seed.Value.ToString(CultureInfo.InvariantCulture)}";
        }
        else
        {
            sample = ReadRows(reader, pair, target, out _);
            method = (plan.Draw == SampleDraw.All ? "all " : "random ") + sample.RowCount.ToString(CultureInfo.InvariantCulture);
        }

        var note = spec.Method == SampleMethod.Tablesample && plan.Draw != SampleDraw.All ? " (SQLite has no table sampling)" : string.Empty;
        return (sample, method + note);
    }

    private static void Bind(SqliteCommand command, SqliteWindow? window, int? rows)
    {
        if (window is not null)
        {
            command.Parameters.AddWithValue("@from", window.From);
            command.Parameters.AddWithValue("@to", window.To);
        }

        if (rows is { } n)
        {
            command.Parameters.AddWithValue("@rows", n);
        }
    }

    private static PairedSample ReadRows(SqliteDataReader reader, PairConfig pair, PairTarget target, out long rows)
    {
        var values = new ValueReader(pair, target);
        var builder = new PairedSampleBuilder();
        rows = 0;
        while (reader.Read())
        {
            values.AddTo(builder, reader);
            rows++;
        }

        values.ThrowIfTextOnly();
        return builder.Build();
    }

    /// <summary>A uniform sample of the window's rows that the seed makes repeatable (SQLite's random() cannot be seeded).</summary>
    private static PairedSample ReadRowsSeeded(SqliteDataReader reader, PairConfig pair, PairTarget target, int rows, int seed)
    {
        var kept = new List<(object X, object Y)>(rows);
        var random = new Random(seed);
        long seen = 0;
        while (reader.Read())
        {
            var row = (reader.GetValue(0), reader.GetValue(1));
            if (seen < rows)
            {
                kept.Add(row);
            }
            else if (random.NextInt64(seen + 1) is var j && j < rows)
            {
                kept[(int)j] = row;
            }

            seen++;
        }

        var values = new ValueReader(pair, target);
        var builder = new PairedSampleBuilder(kept.Count);
        foreach (var (x, y) in kept)
        {
            values.Add(builder, x, y);
        }

        values.ThrowIfTextOnly();
        return builder.Build();
    }

    /// <summary>Sorts each stored value into number, null or text, and notices a column that holds text only.</summary>
    private sealed class ValueReader(PairConfig pair, PairTarget target)
    {
        private long _xNumbers, _yNumbers, _xText, _yText;

        public void AddTo(PairedSampleBuilder builder, SqliteDataReader reader) => Add(builder, reader.GetValue(0), reader.GetValue(1));

        public void Add(PairedSampleBuilder builder, object x, object y)
        {
            var (xv, xText) = Classify(x);
            var (yv, yText) = Classify(y);
            _xNumbers += xv is null ? 0 : 1;
            _yNumbers += yv is null ? 0 : 1;
            _xText += xText ? 1 : 0;
            _yText += yText ? 1 : 0;
            if (xText || yText)
            {
                builder.AddNonNumeric();
            }
            else
            {
                builder.Add(xv, yv);
            }
        }

        public void ThrowIfTextOnly()
        {
            foreach (var (column, numbers, text) in new[] { (pair.X, _xNumbers, _xText), (pair.Y, _yNumbers, _yText) })
            {
                if (numbers == 0 && text > 0)
                {
                    throw new SourceException(SourceFailure.NonNumericColumn, $"Pair '{pair.Name}' ({target.Describe}): column {column} holds text, not numbers.");
                }
            }
        }

        private static (double? Value, bool Text) Classify(object value) => value switch
        {
            long l => (l, false),
            double d => (d, false),
            DBNull or null => (null, false),
            _ => (null, true),
        };
    }

    /// <summary>One open connection, the statement timeout and cancellation wired to sqlite3_interrupt.</summary>
    private sealed class Session : IDisposable
    {
        private readonly SqliteConnection _connection;
        private readonly string _subject;
        private readonly TimeSpan _timeout;
        private readonly CancellationToken _cancellationToken;
        private CancellationTokenSource? _timer;
        private CancellationTokenRegistration _registration;

        public Session(SqliteConnection connection, string subject, TimeSpan timeout, CancellationToken cancellationToken)
        {
            _connection = connection;
            _subject = subject;
            _timeout = timeout;
            _cancellationToken = cancellationToken;
        }

        public bool TimedOut { get; private set; }

        /// <summary>
        /// A command whose statement timeout starts now. With <paramref name="checkSingle"/> the text must be
        /// exactly one statement: Microsoft.Data.Sqlite would otherwise run every statement in it.
        /// </summary>
        public SqliteCommand Command(string sql, bool checkSingle)
        {
            if (checkSingle && HasSecondStatement(sql))
            {
                throw new SourceException(SourceFailure.QueryError, $"{_subject}: the configured SQL holds more than one statement; a filter or query must be a single SELECT.");
            }

            Arm();
            var command = _connection.CreateCommand();
            command.CommandText = sql;
            return command;
        }

        public void Dispose()
        {
            _registration.Dispose();
            _timer?.Dispose();
        }

        private void Arm()
        {
            _registration.Dispose();
            _timer?.Dispose();
            _timer = CancellationTokenSource.CreateLinkedTokenSource(_cancellationToken);
            if (_timeout > TimeSpan.Zero)
            {
                _timer.CancelAfter(_timeout);
            }

            _registration = _timer.Token.Register(() =>
            {
                TimedOut = !_cancellationToken.IsCancellationRequested;
                if (_connection.Handle is { } handle)
                {
                    raw.sqlite3_interrupt(handle);
                }
            });
        }

        private bool HasSecondStatement(string sql)
        {
            if (_connection.Handle is not { } db)
            {
                return false;
            }

            if (raw.sqlite3_prepare_v2(db, sql, out var first, out var tail) != raw.SQLITE_OK)
            {
                first.Dispose();
                // Not preparable at all: executing it reports the error properly.
                return false;
            }

            first.Dispose();
            while (!string.IsNullOrWhiteSpace(tail))
            {
                var rc = raw.sqlite3_prepare_v2(db, tail, out var next, out var rest);
                var isStatement = !next.IsInvalid;
                next.Dispose();
                if (rc != raw.SQLITE_OK || isStatement)
                {
                    return true;
                }

                tail = rest;
            }

            return false;
        }
    }
}
