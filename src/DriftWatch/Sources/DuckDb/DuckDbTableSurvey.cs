using System.Data.Common;
using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;

namespace DriftWatch.Sources.DuckDb;

/// <summary>
/// Surveys a DuckDB table, or Parquet/CSV files by path or glob (<see cref="DuckDbTarget"/>), in one session opened
/// as <see cref="DuckDbPairSource"/> opens one (database files read-only, no extension fetched, each statement
/// interrupted after the source's statement timeout) and one transaction. Numeric columns are those the pair source
/// accepts (integers, FLOAT, DOUBLE, DECIMAL); a value counts when <c>isfinite</c> holds, so NaN and ±Infinity are
/// dropped as a pair's check drops them. The sums of the <see cref="SumPlan"/> come from as few statements as
/// <see cref="MaxResultColumns"/> allows; the sample is every row or a reservoir of n rows (one pass, no sort).
/// </summary>
internal sealed class DuckDbTableSurvey : ITableSurvey
{
    /// <summary>Result columns per statement: wide rows stay cheap to bind and read.</summary>
    public const int MaxResultColumns = 1_000;

    private readonly string _connectionString;
    private readonly string _database;

    public DuckDbTableSurvey(SourceConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        Config = config;
        (_connectionString, _database) = DuckDbPairSource.ConnectionFor(config);
    }

    public SourceConfig Config { get; }

    public Task<TableSurvey> SurveyAsync(SurveyRequest request, IProgress<string>? progress, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(request);
        var text = request.Table.Trim();
        QualifiedName table;
        string from;
        try
        {
            if (DuckDbTarget.IsFile(text))
            {
                var path = !Path.IsPathRooted(text) && Config.BaseDirectory is { } baseDirectory ? Path.Combine(baseDirectory, text) : text;
                from = DuckDbTarget.FileScan(path);
                table = new QualifiedName(null, text);
            }
            else
            {
                table = SqlIdentifier.ParseQualified(text);
                from = table.Quoted;
            }
        }
        catch (ArgumentException e)
        {
            throw new SourceException(SourceFailure.QueryError, $"Table '{request.Table}': {e.Message.Split(" (Parameter", 2)[0]}", e);
        }

        var isFile = DuckDbTarget.IsFile(text);
        return Task.Run(() =>
        {
            var subject = $"Survey of {(isFile ? "files" : "table")} {table} (source '{Config.Name}')";
            using var session = new DuckDbPairSource.Session(subject, Config.StatementTimeout, cancellationToken) { From = from };
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
                Execute(session, "BEGIN TRANSACTION");
                var survey = Survey(session, table, isFile, from, request, progress);
                Execute(session, "ROLLBACK");
                return survey;
            }
            catch (Exception e) when (e is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
            {
                throw DuckDbErrors.Map(e, subject, _database, opening: false, session.TimedOut);
            }
        }, cancellationToken);
    }

    private TableSurvey Survey(DuckDbPairSource.Session session, QualifiedName table, bool isFile, string from, SurveyRequest request, IProgress<string>? progress)
    {
        progress?.Report($"reading the catalogue of {table}");
        var catalogue = isFile ? FileCatalogue(session, from) : TableCatalogue(session, table);
        if (catalogue.Count == 0)
        {
            var tables = Strings(session, """
                SELECT CASE WHEN table_schema = current_schema() THEN table_name ELSE table_schema || '.' || table_name END
                FROM information_schema.tables WHERE table_schema NOT IN ('information_schema', 'pg_catalog')
                """);
            throw new SourceException(SourceFailure.MissingTable, $"no table or view {table} in source '{Config.Name}'{KeyHints.DidYouMean(table.ToString(), tables)}.");
        }

        var selection = ColumnSelection.Choose(catalogue, request.MaxColumns);
        SurveyChecks.EnoughColumns(selection, table, Config.Name);
        var read = $"SELECT {string.Join(", ", selection.Chosen.Select((c, k) => $"CAST({SqlIdentifier.Quote(c)} AS DOUBLE) AS x{k}"))} FROM {from}";

        progress?.Report($"counting the values of {selection.Chosen.Count} columns");
        var stats = SurveySql.ReadStats(selection.Chosen, Row(session,
            $"SELECT {string.Join(", ", selection.Chosen.SelectMany((_, k) => SurveySql.StatsTerms(k, FiniteTest)).Select(t => $"CAST({t} AS DOUBLE)"))} FROM ({read}) r"));

        var plan = new SumPlan(stats);
        var chunks = plan.Terms.Chunk(MaxResultColumns).ToList();
        progress?.Report($"computing the correlation matrix of {stats.Count} columns ({stats.Count * (stats.Count - 1) / 2} pairs, {plan.Terms.Count} sums) in {chunks.Count} statement{(chunks.Count == 1 ? string.Empty : "s")}");
        var deviations = SurveySql.Deviations(stats, read, FiniteTest, "::DOUBLE");
        var values = new List<double>(plan.Terms.Count);
        foreach (var chunk in chunks)
        {
            values.AddRange(Row(session, $"SELECT {string.Join(", ", chunk.Select(t => $"CAST({SurveySql.Term(t)} AS DOUBLE)"))} FROM ({deviations}) c").Select(v => v ?? 0));
        }

        var matrix = plan.Assemble(values);
        var rows = stats[0].Rows;
        var draw = SamplePlanner.Choose(new SampleSpec { Rows = request.SampleRows }, rows, tableRows: null, filtered: true);
        progress?.Report($"drawing one shared sample of {Math.Min(rows, request.SampleRows).ToString("N0", CultureInfo.InvariantCulture)} rows");
        var sample = Sample(session, selection.Chosen, from, draw, request.SampleRows);
        return new TableSurvey(table, catalogue, selection, stats, matrix, sample);
    }

    private static string FiniteTest(string column) => $"isfinite({column})";

    private static bool IsNumeric(string type) => DuckDbPairSource.NumericTypes.Contains(type) || type.StartsWith("DECIMAL", StringComparison.Ordinal);

    private static List<CatalogueColumn> TableCatalogue(DuckDbPairSource.Session session, QualifiedName table)
    {
        var p = new NamedParameters('$');
        var sql = $"""
            SELECT column_name, data_type FROM information_schema.columns
            WHERE table_name = {p.Add(table.Name)} AND table_schema = {(table.Schema is null ? "current_schema()" : p.Add(table.Schema))}
            ORDER BY ordinal_position
            """;
        return Columns(session, sql, p);
    }

    /// <summary>The files' columns as DuckDB reads them; a missing file fails here with DuckDB's own message.</summary>
    private static List<CatalogueColumn> FileCatalogue(DuckDbPairSource.Session session, string from)
    {
        var probe = $"SELECT * FROM {from} LIMIT 0";
        session.RequireSingleSelect(probe);
        return Columns(session, "DESCRIBE " + probe, new NamedParameters('$'));
    }

    private static List<CatalogueColumn> Columns(DuckDbPairSource.Session session, string sql, NamedParameters p)
    {
        using var command = session.Command(sql, p);
        using var reader = command.ExecuteReader();
        var columns = new List<CatalogueColumn>();
        while (reader.Read())
        {
            var type = reader.GetString(1);
            columns.Add(new CatalogueColumn(reader.GetString(0), type, IsNumeric(type)));
        }

        return columns;
    }

    private static SharedSample Sample(DuckDbPairSource.Session session, IReadOnlyList<string> columns, string from, SamplePlan plan, int rows)
    {
        var list = string.Join(", ", columns.Select(c => $"CAST({SqlIdentifier.Quote(c)} AS DOUBLE)"));
        var sql = $"SELECT {list} FROM {from}" + (plan.Draw == SampleDraw.All ? string.Empty : $" USING SAMPLE reservoir({rows.ToString(CultureInfo.InvariantCulture)} ROWS)");
        using var command = session.Command(sql, new NamedParameters('$'));
        using var reader = command.ExecuteReader();
        var values = columns.Select(_ => new List<double?>()).ToArray();
        while (reader.Read())
        {
            for (var k = 0; k < values.Length; k++)
            {
                values[k].Add(reader.IsDBNull(k) ? null : reader.GetDouble(k));
            }
        }

        var count = values[0].Count.ToString(CultureInfo.InvariantCulture);
        return new SharedSample(columns, [.. values.Select(v => v.ToArray())], (plan.Draw == SampleDraw.All ? "all " : "reservoir ") + count);
    }

    private static double?[] Row(DuckDbPairSource.Session session, string sql)
    {
        using var command = session.Command(sql, new NamedParameters('$'));
        using var reader = command.ExecuteReader();
        reader.Read();
        var row = new double?[reader.FieldCount];
        for (var i = 0; i < row.Length; i++)
        {
            row[i] = reader.IsDBNull(i) ? null : reader.GetDouble(i);
        }

        return row;
    }

    private static List<string> Strings(DuckDbPairSource.Session session, string sql)
    {
        using var command = session.Command(sql, new NamedParameters('$'));
        using var reader = command.ExecuteReader();
        var names = new List<string>();
        while (reader.Read())
        {
            names.Add(reader.GetString(0));
        }

        return names;
    }

    private static void Execute(DuckDbPairSource.Session session, string sql)
    {
        using DbCommand command = session.Command(sql, new NamedParameters('$'));
        command.ExecuteNonQuery();
    }
}
