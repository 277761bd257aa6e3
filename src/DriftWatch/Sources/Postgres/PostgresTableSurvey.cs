using System.Data;
using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;
using Npgsql;
using NpgsqlTypes;

namespace DriftWatch.Sources.Postgres;

/// <summary>
/// Surveys a PostgreSQL table in one session and one REPEATABLE READ, READ ONLY transaction (the figures, the
/// matrix and the sample see one snapshot) with the source's statement timeout, as <see cref="PostgresPairSource"/>
/// reads a pair. Four statements: the catalogue (pg_attribute, domains by their base type), the columns' counts and
/// ranges, the matrix (every sum of the <see cref="SumPlan"/> in one array, one scan), and the sample (table sampling
/// or <c>ORDER BY random()</c>, as <see cref="SamplePlanner"/> chooses for a pair).
/// </summary>
internal sealed class PostgresTableSurvey : ITableSurvey
{
    // As PostgresPairSource: types whose values are numbers.
    private static readonly HashSet<string> NumericTypes = ["int2", "int4", "int8", "float4", "float8", "numeric"];

    private readonly string _connectionString;
    private readonly string _endpoint;

    public PostgresTableSurvey(SourceConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        Config = config;
        var builder = new NpgsqlConnectionStringBuilder(config.ConnectionString)
        {
            ApplicationName = PostgresPairSource.ApplicationName,
            CommandTimeout = config.StatementTimeout <= TimeSpan.Zero ? 0 : (int)Math.Ceiling(config.StatementTimeout.TotalSeconds) + 5,
            Pooling = false,
        };
        _endpoint = $"{builder.Host}:{builder.Port.ToString(CultureInfo.InvariantCulture)}";
        _connectionString = builder.ToString();
    }

    public SourceConfig Config { get; }

    public async Task<TableSurvey> SurveyAsync(SurveyRequest request, IProgress<string>? progress, CancellationToken cancellationToken)
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

        var subject = $"Survey of table {table} (source '{Config.Name}')";
        await using var connection = new NpgsqlConnection(_connectionString);
        try
        {
            await connection.OpenAsync(cancellationToken);
        }
        catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
        {
            throw PostgresErrors.MapFor(e, subject, _endpoint, afterConnect: false);
        }

        try
        {
            await using var transaction = await connection.BeginTransactionAsync(IsolationLevel.RepeatableRead, cancellationToken);
            await ExecuteAsync(connection, "SET TRANSACTION READ ONLY", null, cancellationToken);
            await ExecuteAsync(connection, "SELECT set_config('statement_timeout', $1, true)", p => p.Add(TimeoutText(Config.StatementTimeout), NpgsqlDbType.Text), cancellationToken);

            progress?.Report($"reading the catalogue of {table}");
            var (catalogue, numericTypes) = await CatalogueAsync(connection, table, cancellationToken);
            if (catalogue.Count == 0)
            {
                var tables = await TablesAsync(connection, cancellationToken);
                throw new SourceException(SourceFailure.MissingTable, $"no table or view {table} in source '{Config.Name}'{KeyHints.DidYouMean(table.ToString(), tables)}.");
            }

            var selection = ColumnSelection.Choose(catalogue, request.MaxColumns);
            SurveyChecks.EnoughColumns(selection, table, Config.Name);
            var read = Read(selection.Chosen, numericTypes, table);

            progress?.Report($"counting the values of {selection.Chosen.Count} columns");
            var stats = SurveySql.ReadStats(selection.Chosen, await ArrayAsync(connection,
                $"SELECT ARRAY[{string.Join(", ", selection.Chosen.SelectMany((_, k) => SurveySql.StatsTerms(k, FiniteTest)).Select(t => t + "::float8"))}] FROM ({read}) r",
                cancellationToken));

            var plan = new SumPlan(stats);
            progress?.Report($"computing the correlation matrix of {stats.Count} columns ({stats.Count * (stats.Count - 1) / 2} pairs, {plan.Terms.Count} sums) in one statement");
            var values = plan.Terms.Count == 0 ? [] : await ArrayAsync(connection,
                $"SELECT ARRAY[{string.Join(", ", plan.Terms.Select(t => SurveySql.Term(t) + "::float8"))}] FROM ({SurveySql.Deviations(stats, read, FiniteTest, "::float8")}) c",
                cancellationToken);
            var matrix = plan.Assemble([.. values.Select(v => v ?? 0)]);

            var rows = stats.Count == 0 ? 0 : stats[0].Rows;
            var spec = new SampleSpec { Rows = request.SampleRows };
            var planDraw = SamplePlanner.Choose(spec, rows, await EstimateRowsAsync(connection, table, cancellationToken), filtered: false);
            progress?.Report($"drawing one shared sample of {Math.Min(rows, request.SampleRows).ToString("N0", CultureInfo.InvariantCulture)} rows");
            var sample = await SampleAsync(connection, selection.Chosen, numericTypes, table, planDraw, request.SampleRows, cancellationToken);

            await transaction.RollbackAsync(cancellationToken);
            return new TableSurvey(table, catalogue, selection, stats, matrix, sample);
        }
        catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
        {
            throw PostgresErrors.MapFor(e, subject, _endpoint, afterConnect: true);
        }
    }

    private static string FiniteTest(string column) => $"{column} > '-Infinity'::float8 AND {column} < 'Infinity'::float8";

    /// <summary>x0…x{n−1}: every column as float8, numeric ones through the range guard of a pair's check.</summary>
    private static string Read(IReadOnlyList<string> columns, Dictionary<string, bool> numericType, QualifiedName table) =>
        $"SELECT {string.Join(", ", columns.Select((c, k) => $"{PostgresPairSql.Float8(SqlIdentifier.Quote(c), numericType[c])} AS x{k}"))} FROM {table.Quoted}";

    /// <summary>The columns in catalogue order, and which numeric ones are of type numeric (they need the range guard).</summary>
    private static async Task<(List<CatalogueColumn> Columns, Dictionary<string, bool> NumericType)> CatalogueAsync(NpgsqlConnection connection, QualifiedName table, CancellationToken ct)
    {
        const string Sql = """
            SELECT a.attname::text, format_type(a.atttypid, a.atttypmod), coalesce(b.typname, t.typname)::text
            FROM pg_attribute a
            JOIN pg_type t ON t.oid = a.atttypid
            LEFT JOIN pg_type b ON t.typtype = 'd' AND b.oid = t.typbasetype
            WHERE a.attrelid = to_regclass($1) AND a.attnum > 0 AND NOT a.attisdropped
            ORDER BY a.attnum
            """;
        var p = new PositionalParameters();
        p.Add(table.Quoted, NpgsqlDbType.Text);
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(p.Command(Sql));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        var columns = new List<CatalogueColumn>();
        var numericType = new Dictionary<string, bool>(StringComparer.Ordinal);
        while (await reader.ReadAsync(ct))
        {
            var name = reader.GetString(0);
            var baseType = reader.GetString(2);
            var numeric = NumericTypes.Contains(baseType);
            columns.Add(new CatalogueColumn(name, reader.GetString(1), numeric));
            numericType[name] = baseType == "numeric";
        }

        return (columns, numericType);
    }

    /// <summary>The tables and views the session can see, for a did-you-mean; schema-qualified outside the search path.</summary>
    private static async Task<List<string>> TablesAsync(NpgsqlConnection connection, CancellationToken ct)
    {
        const string Sql = """
            SELECT CASE WHEN n.nspname = ANY (current_schemas(false)) THEN c.relname::text ELSE n.nspname || '.' || c.relname END
            FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
            WHERE c.relkind IN ('r', 'v', 'm', 'p', 'f') AND n.nspname NOT IN ('pg_catalog', 'information_schema') AND n.nspname NOT LIKE 'pg_toast%'
            """;
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(new NpgsqlBatchCommand(Sql));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        var names = new List<string>();
        while (await reader.ReadAsync(ct))
        {
            names.Add(reader.GetString(0));
        }

        return names;
    }

    private static async Task<double?[]> ArrayAsync(NpgsqlConnection connection, string sql, CancellationToken ct)
    {
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(new NpgsqlBatchCommand(sql));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        await reader.ReadAsync(ct);
        return reader.GetFieldValue<double?[]>(0);
    }

    /// <summary>As for a pair: the planner's row estimate, or null when the relation cannot be table-sampled.</summary>
    private static async Task<double?> EstimateRowsAsync(NpgsqlConnection connection, QualifiedName table, CancellationToken ct)
    {
        const string Sql = "SELECT c.relkind::text, c.reltuples::float8 FROM pg_class c WHERE c.oid = to_regclass($1)";
        var p = new PositionalParameters();
        p.Add(table.Quoted, NpgsqlDbType.Text);
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(p.Command(Sql));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        return await reader.ReadAsync(ct) && reader.GetString(0) is "r" or "m" ? reader.GetDouble(1) : null;
    }

    private static async Task<SharedSample> SampleAsync(
        NpgsqlConnection connection, IReadOnlyList<string> columns, Dictionary<string, bool> numericType, QualifiedName table, SamplePlan plan, int rows, CancellationToken ct)
    {
        var p = new PositionalParameters();
        var list = string.Join(", ", columns.Select(c => PostgresPairSql.Float8(SqlIdentifier.Quote(c), numericType[c])));
        var sql = plan.Draw switch
        {
            SampleDraw.All => $"SELECT {list} FROM {table.Quoted}",
            SampleDraw.Random => $"SELECT {list} FROM {table.Quoted} ORDER BY random() LIMIT {p.Add(rows, NpgsqlDbType.Integer)}",
            _ => $"SELECT {list} FROM {table.Quoted} TABLESAMPLE SYSTEM ({p.Add((float)plan.Percent!.Value, NpgsqlDbType.Real)}) ORDER BY random() LIMIT {p.Add(rows, NpgsqlDbType.Integer)}",
        };
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(p.Command(sql));
        await using var reader = await batch.ExecuteReaderAsync(CommandBehavior.SequentialAccess, ct);
        var values = columns.Select(_ => new List<double?>()).ToArray();
        while (await reader.ReadAsync(ct))
        {
            for (var k = 0; k < values.Length; k++)
            {
                values[k].Add(await reader.IsDBNullAsync(k, ct) ? null : reader.GetDouble(k));
            }
        }

        var count = values.Length == 0 ? 0 : values[0].Count;
        var method = plan.Draw switch
        {
            SampleDraw.All => $"all {count}",
            SampleDraw.Random => $"random {count}",
            _ => $"tablesample system {SamplePlanner.FormatPercent(plan.Percent!.Value)}% {count}",
        };
        return new SharedSample(columns, [.. values.Select(v => v.ToArray())], method);
    }

    private static async Task ExecuteAsync(NpgsqlConnection connection, string sql, Action<PositionalParameters>? bind, CancellationToken ct)
    {
        var p = new PositionalParameters();
        bind?.Invoke(p);
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(p.Command(sql));
        await batch.ExecuteNonQueryAsync(ct);
    }

    private static string TimeoutText(TimeSpan timeout) =>
        timeout <= TimeSpan.Zero ? "0" : ((long)Math.Ceiling(timeout.TotalMilliseconds)).ToString(CultureInfo.InvariantCulture);
}
