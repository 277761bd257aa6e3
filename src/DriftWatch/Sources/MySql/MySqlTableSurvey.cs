using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;
using MySqlConnector;

namespace DriftWatch.Sources.MySql;

/// <summary>
/// Surveys a MySQL or MariaDB table in one session and one <c>START TRANSACTION WITH CONSISTENT SNAPSHOT, READ ONLY</c>
/// with the server's statement timeout, as <see cref="MySqlPairSource"/> reads a pair. Numeric columns come from
/// information_schema (integers, DECIMAL, FLOAT, DOUBLE, YEAR, as the pair source accepts). DOUBLE holds no NaN or
/// infinity in MySQL or MariaDB, so a value counts when it is not NULL. Neither server has aggregate FILTER clauses:
/// the pairwise terms are CASE expressions inside the aggregates. The sample is every row, or rows kept with
/// probability q (<see cref="MySqlPairSql.KeepProbability"/>) and only those put in random order: no sort of the table.
/// </summary>
internal sealed class MySqlTableSurvey : ITableSurvey
{
    /// <summary>Result columns per statement, under the servers' limit of 4,096 columns.</summary>
    public const int MaxResultColumns = 1_000;

    private static readonly HashSet<string> NumericTypes =
        ["tinyint", "smallint", "mediumint", "int", "integer", "bigint", "decimal", "numeric", "float", "double", "real", "year"];

    private readonly string _connectionString;
    private readonly string _endpoint;

    public MySqlTableSurvey(SourceConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        Config = config;
        var builder = new MySqlConnectionStringBuilder(config.ConnectionString)
        {
            // The server's timeout decides; the client waits a little longer so the server's clear error wins.
            DefaultCommandTimeout = config.StatementTimeout <= TimeSpan.Zero ? 0u : (uint)Math.Ceiling(config.StatementTimeout.TotalSeconds) + 5,
            ApplicationName = "driftwatch",
            AllowUserVariables = false,
            Pooling = false,
        };
        _endpoint = $"{builder.Server}:{builder.Port.ToString(CultureInfo.InvariantCulture)}";
        _connectionString = builder.ConnectionString;
    }

    public SourceConfig Config { get; }

    public async Task<TableSurvey> SurveyAsync(SurveyRequest request, IProgress<string>? progress, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(request);
        QualifiedName table;
        try
        {
            table = SqlIdentifier.ParseQualified(request.Table.Trim());
            _ = table.Backticked;
        }
        catch (ArgumentException e)
        {
            throw new SourceException(SourceFailure.QueryError, $"Table '{request.Table}': {e.Message.Split(" (Parameter", 2)[0]}", e);
        }

        var subject = $"Survey of table {table} (source '{Config.Name}')";
        await using var connection = new MySqlConnection(_connectionString);
        try
        {
            await connection.OpenAsync(cancellationToken);
            await BeginAsync(connection, Config.StatementTimeout, cancellationToken);
        }
        catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
        {
            throw MySqlErrors.Map(e, subject, _endpoint, opening: true);
        }

        try
        {
            var survey = await SurveyAsync(connection, table, request, progress, cancellationToken);
            await ExecuteAsync(connection, "ROLLBACK", cancellationToken);
            return survey;
        }
        catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
        {
            throw MySqlErrors.Map(e, subject, _endpoint, opening: false);
        }
    }

    private async Task<TableSurvey> SurveyAsync(MySqlConnection connection, QualifiedName table, SurveyRequest request, IProgress<string>? progress, CancellationToken ct)
    {
        progress?.Report($"reading the catalogue of {table}");
        var catalogue = await CatalogueAsync(connection, table, ct);
        if (catalogue.Count == 0)
        {
            var tables = await StringsAsync(connection, "SELECT TABLE_NAME FROM information_schema.TABLES WHERE TABLE_SCHEMA = DATABASE()", ct);
            throw new SourceException(SourceFailure.MissingTable, $"no table or view {table} in source '{Config.Name}'{KeyHints.DidYouMean(table.ToString(), tables)}.");
        }

        var selection = ColumnSelection.Choose(catalogue, request.MaxColumns);
        SurveyChecks.EnoughColumns(selection, table, Config.Name);
        var read = $"SELECT {string.Join(", ", selection.Chosen.Select((c, k) => $"CAST({SqlIdentifier.Backtick(c)} AS DOUBLE) AS x{k}"))} FROM {table.Backticked}";

        progress?.Report($"counting the values of {selection.Chosen.Count} columns");
        var statsTerms = selection.Chosen.SelectMany((_, k) => new[] { "COUNT(*)", $"COUNT(x{k})", $"COUNT(x{k})", $"MIN(x{k})", $"MAX(x{k})" });
        var stats = SurveySql.ReadStats(selection.Chosen, await RowAsync(connection, $"SELECT {string.Join(", ", statsTerms)} FROM ({read}) r", ct));

        var plan = new SumPlan(stats);
        var chunks = plan.Terms.Chunk(MaxResultColumns).ToList();
        progress?.Report($"computing the correlation matrix of {stats.Count} columns ({stats.Count * (stats.Count - 1) / 2} pairs, {plan.Terms.Count} sums) in {chunks.Count} statement{(chunks.Count == 1 ? string.Empty : "s")}");
        var deviations = SurveySql.Deviations(stats, read, FiniteTest, string.Empty);
        var values = new List<double>(plan.Terms.Count);
        foreach (var chunk in chunks)
        {
            values.AddRange((await RowAsync(connection, $"SELECT {string.Join(", ", chunk.Select(Term))} FROM ({deviations}) c", ct)).Select(v => v ?? 0));
        }

        var matrix = plan.Assemble(values);
        var rows = stats[0].Rows;
        var draw = SamplePlanner.Choose(new SampleSpec { Rows = request.SampleRows }, rows, tableRows: null, filtered: true);
        progress?.Report($"drawing one shared sample of {Math.Min(rows, request.SampleRows).ToString("N0", CultureInfo.InvariantCulture)} rows");
        var sample = await SampleAsync(connection, selection.Chosen, table, draw, request.SampleRows, rows, ct);
        return new TableSurvey(table, catalogue, selection, stats, matrix, sample);
    }

    private static string FiniteTest(string column) => $"{column} IS NOT NULL";

    /// <summary>One aggregate of the plan without FILTER; a sum over no rows is 0.</summary>
    private static string Term(SumTerm term) => term.Kind switch
    {
        SumKind.PairCount => $"COUNT(CASE WHEN u{term.I} IS NOT NULL AND u{term.J} IS NOT NULL THEN 1 END)",
        SumKind.PairSum => $"COALESCE(SUM(CASE WHEN u{term.J} IS NOT NULL THEN u{term.I} END), 0)",
        SumKind.PairSumSquares => $"COALESCE(SUM(CASE WHEN u{term.J} IS NOT NULL THEN u{term.I} * u{term.I} END), 0)",
        _ => SurveySql.Term(term),
    };

    /// <summary>As <see cref="MySqlPairSource"/>: UTC, the server's statement timeout, then the read-only snapshot.</summary>
    private static async Task BeginAsync(MySqlConnection connection, TimeSpan timeout, CancellationToken ct)
    {
        var mariaDb = connection.ServerVersion.Contains("MariaDB", StringComparison.OrdinalIgnoreCase);
        var seconds = timeout <= TimeSpan.Zero ? 0 : timeout.TotalSeconds;
        var limit = mariaDb
            ? "max_statement_time = " + seconds.ToString("0.###", CultureInfo.InvariantCulture)
            : "max_execution_time = " + ((long)Math.Ceiling(seconds * 1000)).ToString(CultureInfo.InvariantCulture);
        await ExecuteAsync(connection, $"SET SESSION time_zone = '+00:00', SESSION {limit}; SET TRANSACTION ISOLATION LEVEL REPEATABLE READ; START TRANSACTION WITH CONSISTENT SNAPSHOT, READ ONLY", ct);
    }

    private static async Task<List<CatalogueColumn>> CatalogueAsync(MySqlConnection connection, QualifiedName table, CancellationToken ct)
    {
        var schema = table.Schema is null ? "DATABASE()" : "@s";
        await using var command = new MySqlCommand(
            $"SELECT COLUMN_NAME, DATA_TYPE, COLUMN_TYPE FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = {schema} AND TABLE_NAME = @t ORDER BY ORDINAL_POSITION",
            connection);
        command.Parameters.AddWithValue("@t", table.Name);
        if (table.Schema is not null)
        {
            command.Parameters.AddWithValue("@s", table.Schema);
        }

        await using var reader = await command.ExecuteReaderAsync(ct);
        var columns = new List<CatalogueColumn>();
        while (await reader.ReadAsync(ct))
        {
            var dataType = reader.GetString(1);
            columns.Add(new CatalogueColumn(reader.GetString(0), reader.GetString(2), NumericTypes.Contains(dataType.ToLowerInvariant())));
        }

        return columns;
    }

    private static async Task<SharedSample> SampleAsync(
        MySqlConnection connection, IReadOnlyList<string> columns, QualifiedName table, SamplePlan plan, int rows, long tableRows, CancellationToken ct)
    {
        var list = string.Join(", ", columns.Select((c, k) => $"CAST({SqlIdentifier.Backtick(c)} AS DOUBLE) AS x{k}"));
        var all = $"SELECT {list} FROM {table.Backticked}";
        var keep = MySqlPairSql.KeepProbability(rows, tableRows);
        var sql = plan.Draw == SampleDraw.All
            ? all
            : $"SELECT * FROM ({all} WHERE RAND() < @keep) s ORDER BY RAND() LIMIT {rows.ToString(CultureInfo.InvariantCulture)}";
        await using var command = new MySqlCommand(sql, connection);
        command.Parameters.AddWithValue("@keep", keep);
        await using var reader = await command.ExecuteReaderAsync(ct);
        var values = columns.Select(_ => new List<double?>()).ToArray();
        while (await reader.ReadAsync(ct))
        {
            for (var k = 0; k < values.Length; k++)
            {
                values[k].Add(reader.IsDBNull(k) ? null : reader.GetDouble(k));
            }
        }

        var count = values[0].Count.ToString(CultureInfo.InvariantCulture);
        var method = plan.Draw == SampleDraw.All ? $"all {count}" : $"random filter {SamplePlanner.FormatPercent(100 * keep)}% {count}";
        return new SharedSample(columns, [.. values.Select(v => v.ToArray())], method);
    }

    private static async Task<double?[]> RowAsync(MySqlConnection connection, string sql, CancellationToken ct)
    {
        await using var command = new MySqlCommand(sql, connection);
        await using var reader = await command.ExecuteReaderAsync(ct);
        await reader.ReadAsync(ct);
        var row = new double?[reader.FieldCount];
        for (var i = 0; i < row.Length; i++)
        {
            row[i] = reader.IsDBNull(i) ? null : Convert.ToDouble(reader.GetValue(i), CultureInfo.InvariantCulture);
        }

        return row;
    }

    private static async Task<List<string>> StringsAsync(MySqlConnection connection, string sql, CancellationToken ct)
    {
        await using var command = new MySqlCommand(sql, connection);
        await using var reader = await command.ExecuteReaderAsync(ct);
        var names = new List<string>();
        while (await reader.ReadAsync(ct))
        {
            names.Add(reader.GetString(0));
        }

        return names;
    }

    private static async Task ExecuteAsync(MySqlConnection connection, string sql, CancellationToken ct)
    {
        await using var command = new MySqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync(ct);
    }
}
