using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;
using Microsoft.Data.Sqlite;
using SQLitePCL;

namespace DriftWatch.Sources.Sqlite;

/// <summary>
/// Surveys a SQLite table as <see cref="SqlitePairSource"/> reads a pair: the file opened with Mode=ReadOnly and
/// <c>PRAGMA query_only</c>, the statement timeout enforced by sqlite3_interrupt, every statement in one deferred
/// read transaction (one snapshot). Numeric columns are those of INTEGER, REAL or NUMERIC affinity
/// (<see cref="SqliteAffinityRules"/>); a value counts when it is stored as an integer or a real and is finite.
/// SQLite returns at most 2,000 columns from a statement, so the matrix's sums come from as few statements as that
/// allows (one up to 30 complete columns), all in the same transaction. The sample is every row, or
/// <c>ORDER BY random() LIMIT n</c> (SQLite has no table sampling).
/// </summary>
internal sealed class SqliteTableSurvey : ITableSurvey
{
    /// <summary>Result columns per statement, well under SQLite's default limit of 2,000 (SQLITE_MAX_COLUMN).</summary>
    public const int MaxResultColumns = 1_000;

    private readonly string _connectionString;
    private readonly string _file;

    public SqliteTableSurvey(SourceConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        Config = config;
        var builder = new SqliteConnectionStringBuilder(config.ConnectionString) { Mode = SqliteOpenMode.ReadOnly, Pooling = false };
        _file = builder.DataSource;
        _connectionString = builder.ToString();
    }

    public SourceConfig Config { get; }

    public Task<TableSurvey> SurveyAsync(SurveyRequest request, IProgress<string>? progress, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(request);
        QualifiedName table;
        try
        {
            table = SqlIdentifier.ParseQualified(request.Table.Trim());
        }
        catch (ArgumentException e)
        {
            throw new SourceException(SourceFailure.QueryError, $"Table '{request.Table}': {e.Message.Split(" (Parameter", 2)[0]}", e);
        }

        return Task.Run(() =>
        {
            using var connection = new SqliteConnection(_connectionString);
            using var timer = new Interrupter(connection, Config.StatementTimeout, cancellationToken);
            try
            {
                connection.Open();
                Execute(connection, "PRAGMA query_only = ON; PRAGMA busy_timeout = " +
                    ((long)Math.Clamp(Config.StatementTimeout.TotalMilliseconds, 0, int.MaxValue)).ToString(CultureInfo.InvariantCulture) + ";");
                using var transaction = connection.BeginTransaction(deferred: true);
                return Survey(connection, timer, table, request, progress);
            }
            catch (Exception e) when (e is not OperationCanceledException)
            {
                cancellationToken.ThrowIfCancellationRequested();
                throw SqliteErrors.MapFor(e, $"Survey of table {table} (source '{Config.Name}')", _file, timer.TimedOut);
            }
        }, cancellationToken);
    }

    private TableSurvey Survey(SqliteConnection connection, Interrupter timer, QualifiedName table, SurveyRequest request, IProgress<string>? progress)
    {
        progress?.Report($"reading the catalogue of {table}");
        var catalogue = Catalogue(connection, table);
        if (catalogue.Count == 0)
        {
            var tables = Strings(connection, "SELECT name FROM sqlite_master WHERE type IN ('table', 'view') AND name NOT LIKE 'sqlite_%'");
            throw new SourceException(SourceFailure.MissingTable, $"no table or view {table} in source '{Config.Name}'{KeyHints.DidYouMean(table.ToString(), tables)}.");
        }

        var selection = ColumnSelection.Choose(catalogue, request.MaxColumns);
        SurveyChecks.EnoughColumns(selection, table, Config.Name);
        var read = $"SELECT {string.Join(", ", selection.Chosen.Select((c, k) => $"{SqlIdentifier.Quote(c)} AS x{k}"))} FROM {table.Quoted}";

        progress?.Report($"counting the values of {selection.Chosen.Count} columns");
        timer.Arm();
        var stats = SurveySql.ReadStats(selection.Chosen, Row(connection,
            $"SELECT {string.Join(", ", selection.Chosen.SelectMany((_, k) => SurveySql.StatsTerms(k, FiniteTest)))} FROM ({read}) r"));

        var plan = new SumPlan(stats);
        var chunks = plan.Terms.Chunk(MaxResultColumns).ToList();
        progress?.Report($"computing the correlation matrix of {stats.Count} columns ({stats.Count * (stats.Count - 1) / 2} pairs, {plan.Terms.Count} sums) in {chunks.Count} statement{(chunks.Count == 1 ? string.Empty : "s")}");
        var deviations = SurveySql.Deviations(stats, read, FiniteTest, string.Empty);
        var values = new List<double>(plan.Terms.Count);
        foreach (var chunk in chunks)
        {
            timer.Arm();
            values.AddRange(Row(connection, $"SELECT {string.Join(", ", chunk.Select(SurveySql.Term))} FROM ({deviations}) c").Select(v => v ?? 0));
        }

        var matrix = plan.Assemble(values);
        var rows = stats[0].Rows;
        var draw = SamplePlanner.Choose(new SampleSpec { Rows = request.SampleRows }, rows, tableRows: null, filtered: true);
        progress?.Report($"drawing one shared sample of {Math.Min(rows, request.SampleRows).ToString("N0", CultureInfo.InvariantCulture)} rows");
        timer.Arm();
        var sample = Sample(connection, selection.Chosen, table, draw, request.SampleRows);
        return new TableSurvey(table, catalogue, selection, stats, matrix, sample);
    }

    private static string FiniteTest(string column) =>
        $"(typeof({column}) IN ('integer', 'real') AND {column} > -9e999 AND {column} < 9e999)";

    private static List<CatalogueColumn> Catalogue(SqliteConnection connection, QualifiedName table)
    {
        using var command = connection.CreateCommand();
        command.CommandText = table.Schema is null ? "SELECT name, type FROM pragma_table_info(@t)" : "SELECT name, type FROM pragma_table_info(@t, @s)";
        command.Parameters.AddWithValue("@t", table.Name);
        if (table.Schema is not null)
        {
            command.Parameters.AddWithValue("@s", table.Schema);
        }

        using var reader = command.ExecuteReader();
        var columns = new List<CatalogueColumn>();
        while (reader.Read())
        {
            var type = reader.IsDBNull(1) ? string.Empty : reader.GetString(1);
            columns.Add(new CatalogueColumn(reader.GetString(0), type, SqliteAffinityRules.Of(type) is SqliteAffinity.Integer or SqliteAffinity.Real or SqliteAffinity.Numeric));
        }

        return columns;
    }

    private static SharedSample Sample(SqliteConnection connection, IReadOnlyList<string> columns, QualifiedName table, SamplePlan plan, int rows)
    {
        using var command = connection.CreateCommand();
        command.CommandText = $"SELECT {string.Join(", ", columns.Select(SqlIdentifier.Quote))} FROM {table.Quoted}" + (plan.Draw == SampleDraw.All ? string.Empty : " ORDER BY random() LIMIT @rows");
        command.Parameters.AddWithValue("@rows", rows);
        using var reader = command.ExecuteReader();
        var values = columns.Select(_ => new List<double?>()).ToArray();
        while (reader.Read())
        {
            for (var k = 0; k < values.Length; k++)
            {
                values[k].Add(reader.GetValue(k) switch
                {
                    long l => l,
                    double d => d,
                    DBNull => null,
                    // Text or a blob in a numeric column: not a number, dropped like a non-finite value.
                    _ => double.NaN,
                });
            }
        }

        var count = values[0].Count.ToString(CultureInfo.InvariantCulture);
        return new SharedSample(columns, [.. values.Select(v => v.ToArray())], (plan.Draw == SampleDraw.All ? "all " : "random ") + count);
    }

    private static double?[] Row(SqliteConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        using var reader = command.ExecuteReader();
        reader.Read();
        var row = new double?[reader.FieldCount];
        for (var i = 0; i < row.Length; i++)
        {
            row[i] = reader.IsDBNull(i) ? null : reader.GetDouble(i);
        }

        return row;
    }

    private static List<string> Strings(SqliteConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        using var reader = command.ExecuteReader();
        var names = new List<string>();
        while (reader.Read())
        {
            names.Add(reader.GetString(0));
        }

        return names;
    }

    private static void Execute(SqliteConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        command.ExecuteNonQuery();
    }

    /// <summary>The statement timeout: each statement armed anew, cancellation and timeout wired to sqlite3_interrupt.</summary>
    private sealed class Interrupter(SqliteConnection connection, TimeSpan timeout, CancellationToken cancellationToken) : IDisposable
    {
        private CancellationTokenSource? _timer;
        private CancellationTokenRegistration _registration;

        public bool TimedOut { get; private set; }

        public void Arm()
        {
            _registration.Dispose();
            _timer?.Dispose();
            _timer = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
            if (timeout > TimeSpan.Zero)
            {
                _timer.CancelAfter(timeout);
            }

            _registration = _timer.Token.Register(() =>
            {
                TimedOut = !cancellationToken.IsCancellationRequested;
                if (connection.Handle is { } handle)
                {
                    raw.sqlite3_interrupt(handle);
                }
            });
        }

        public void Dispose()
        {
            _registration.Dispose();
            _timer?.Dispose();
        }
    }
}
