using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;
using DriftWatch.Core.Statistics;
using DriftWatch.Sources;
using DriftWatch.Sources.DuckDb;
using DuckDB.NET.Data;

namespace DriftWatch.IntegrationTests.Discovery;

/// <summary>
/// <c>discover</c> on DuckDB in-process: the planted table of <see cref="PlantedTable"/> in a database file (NaN and
/// +∞ kept as DOUBLE values), and the same rows as two Parquet files written by DuckDB's own COPY, read by glob.
/// </summary>
public sealed class DuckDbDiscoveryTests : IDisposable
{
    private readonly string _folder = Directory.CreateTempSubdirectory("dw-discover-duck-").FullName;
    private readonly string _database;
    private readonly string _glob;

    public DuckDbDiscoveryTests()
    {
        _database = Path.Combine(_folder, "lake.duckdb");
        var parts = Path.Combine(_folder, "parcels");
        Directory.CreateDirectory(parts);
        _glob = Path.Combine(parts, "*.parquet");
        using var connection = new DuckDBConnection($"Data Source={_database}");
        connection.Open();
        Execute(connection, PlantedTable.CreateSql("DOUBLE", Literal, PlantedTable.Generate()));
        Execute(connection, "CREATE TABLE notes (title TEXT, body TEXT, amount DOUBLE)");
        Execute(connection, $"COPY (SELECT * FROM parcels WHERE rowid < 1000) TO '{Path.Combine(parts, "part1.parquet")}' (FORMAT parquet)");
        Execute(connection, $"COPY (SELECT * FROM parcels WHERE rowid >= 1000) TO '{Path.Combine(parts, "part2.parquet")}' (FORMAT parquet)");
    }

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    [Fact]
    public async Task Survey_Table_MatrixMatchesDuckDbsCorrAndMathNetOnEveryPair()
    {
        var survey = await Survey("parcels", 10_000);
        AssertMatrix(survey, $"Data Source={_database};ACCESS_MODE=READ_ONLY", "parcels");
        Assert.Equal("all 2000", survey.Sample.Method);
    }

    [Fact]
    public async Task Survey_ParquetGlob_MatrixMatchesDuckDbsCorrAndMathNetOnEveryPair()
    {
        var survey = await Survey(_glob, 10_000, files: true);
        Assert.Equal(_glob, survey.Table.ToString());
        AssertMatrix(survey, "Data Source=:memory:", $"read_parquet('{_glob}')");
    }

    [Fact]
    public async Task Survey_PlantedDerivations_AreFoundWithTheirEquations_InTheTableAndTheFiles()
    {
        foreach (var (table, files) in new[] { ("parcels", false), (_glob, true) })
        {
            var survey = await Survey(table, 10_000, files);
            var result = TableDiscovery.Assess(survey.Matrix, survey.Sample, 0.5, Thresholds.Default);
            var pounds = Assert.Single(result.Derivations, d => d.Column == "lb");
            Assert.Equal(("kg", DerivationKind.Affine), (pounds.From, pounds.Kind));
            Assert.Equal(PlantedTable.PoundsPerKilogram, pounds.Slope!.Value, 9);
            Assert.StartsWith("lb = 2.2046226", pounds.Equation, StringComparison.Ordinal);
            var sum = Assert.Single(result.Derivations, d => d.Column == "total");
            Assert.Equal(("net", "total = net + 4.5"), (sum.From, sum.Equation));
            Assert.Equal(2, result.Derivations.Count);
            Assert.Equal(("c01", "c02"), (result.Candidates[0].X, result.Candidates[0].Y));
            Assert.DoesNotContain(result.Candidates, c => c.X is "lb" or "total" || c.Y is "lb" or "total");
        }
    }

    [Fact]
    public async Task Survey_LargeTable_SamplesAReservoirOfExactlyThatManyWholeRows()
    {
        // 60,000 rows, above the 50,000 read whole: the shared sample is drawn, and its rows stay whole.
        using (var connection = new DuckDBConnection($"Data Source={_database}"))
        {
            connection.Open();
            Execute(connection, $"CREATE TABLE crates AS SELECT CAST(1 + i % 397 AS DOUBLE) AS kg, (1 + i % 397) * {PlantedTable.PoundsPerKilogram.ToString("R", CultureInfo.InvariantCulture)} AS lb FROM range(60000) t(i)");
        }

        var survey = await Survey("crates", 500);
        Assert.Equal("reservoir 500", survey.Sample.Method);
        Assert.Equal(60_000, survey.Matrix.N(0, 1));
        var pair = survey.Sample.Pair(0, 1);
        Assert.Equal(500, pair.UsedCount);
        // Whole rows: each lb is its own row's kg times the factor (within 1e-9: the engine may round the product once more
        // than C# does); a row of another kg would be at least 2.2 off.
        Assert.All(Enumerable.Range(0, 500), i => Assert.Equal(pair.X[i] * PlantedTable.PoundsPerKilogram, pair.Y[i], 1e-9));
    }

    [Fact]
    public async Task Cli_ProposedYaml_LoadsThroughTheConfigLoader()
    {
        var config = Path.Combine(_folder, "driftwatch.yaml");
        await File.WriteAllTextAsync(config, $"""
            sources:
              - name: lake
                kind: duckdb
                connection: "Data Source={_database}"

            """);
        var (exit, yaml, error) = await PlantedTable.CliAsync("discover", "--config", config, "--source", "lake", "--table", "parcels", "--format", "yaml");
        Assert.True(exit == 0, error);
        Assert.Contains("# total = net + 4.5 on every row", yaml, StringComparison.Ordinal);

        var merged = Path.Combine(_folder, "merged.yaml");
        await File.WriteAllTextAsync(merged, await File.ReadAllTextAsync(config) + yaml);
        var loaded = ConfigLoader.Load(merged, _ => null);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));
        var pounds = Assert.Single(loaded.Config!.Pairs, p => p.Name == "parcels.lb_vs_kg");
        Assert.Equal(("lake", "kg", "lb", true), (pounds.Source, pounds.X, pounds.Y, pounds.Declared.Exact));
        var validate = await PlantedTable.CliAsync("validate", "--config", merged);
        Assert.True(validate.Exit == 0, validate.Out + validate.Error);
        Assert.Contains("✓ parcels.total_vs_net", validate.Out, StringComparison.Ordinal);

        var missing = await PlantedTable.CliAsync("discover", "--config", config, "--source", "lake", "--table", "parcel");
        Assert.Equal(2, missing.Exit);
        Assert.Contains("no table or view parcel in source 'lake' (did you mean 'parcels'?)", missing.Error, StringComparison.Ordinal);
        var text = await PlantedTable.CliAsync("discover", "--config", config, "--source", "lake", "--table", "notes");
        Assert.Equal(2, text.Exit);
        Assert.Contains("has only one numeric column (amount)", text.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Cli_ParquetGlob_ProposesPairsOnThePathThatLoadAndValidate()
    {
        var config = Path.Combine(_folder, "files.yaml");
        await File.WriteAllTextAsync(config, "sources:\n  - name: files\n    kind: duckdb\n");
        var (exit, yaml, error) = await PlantedTable.CliAsync("discover", "--config", config, "--source", "files", "--table", _glob, "--format", "yaml");
        Assert.True(exit == 0, error);
        Assert.Contains($"  table: \"{_glob}\"", yaml, StringComparison.Ordinal);

        var merged = Path.Combine(_folder, "files-merged.yaml");
        await File.WriteAllTextAsync(merged, await File.ReadAllTextAsync(config) + yaml);
        var loaded = ConfigLoader.Load(merged, _ => null);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));
        // Named after the folder the glob reads, not the whole path.
        var pounds = Assert.Single(loaded.Config!.Pairs, p => p.Name == "parcels.lb_vs_kg");
        Assert.Equal((_glob, "kg", "lb", true), (pounds.Table, pounds.X, pounds.Y, pounds.Declared.Exact));
        var validate = await PlantedTable.CliAsync("validate", "--config", merged);
        Assert.True(validate.Exit == 0, validate.Out + validate.Error);
        Assert.Contains("✓ parcels.total_vs_net", validate.Out, StringComparison.Ordinal);
    }

    /// <summary>DuckDB's own corr() and count over the rows where both values are finite, and MathNet over the rows read back.</summary>
    private static void AssertMatrix(TableSurvey survey, string connectionString, string from)
    {
        var columns = PlantedTable.Columns;
        Assert.Equal(columns, survey.Matrix.Columns);
        var pairs = (from i in Enumerable.Range(0, columns.Length) from j in Enumerable.Range(i + 1, columns.Length - i - 1) select (i, j)).ToList();
        using var connection = new DuckDBConnection(connectionString);
        connection.Open();
        string Both(int i, int j) => $"isfinite({columns[i]}) AND isfinite({columns[j]})";
        var oracle = Row(connection, "SELECT " + string.Join(", ", pairs.SelectMany(p => new[]
        {
            $"CAST(corr({columns[p.j]}, {columns[p.i]}) FILTER (WHERE {Both(p.i, p.j)}) AS DOUBLE)",
            $"CAST(count(*) FILTER (WHERE {Both(p.i, p.j)}) AS DOUBLE)",
        })) + $" FROM {from}")[0];
        var rows = Row(connection, $"SELECT {string.Join(", ", columns)} FROM {from}");
        for (var k = 0; k < pairs.Count; k++)
        {
            var (i, j) = pairs[k];
            var (mathNet, n) = PlantedTable.MathNetPearson(rows, i, j);
            Assert.Equal(oracle[2 * k]!.Value, survey.Matrix.R(i, j)!.Value, 9);
            Assert.Equal(mathNet!.Value, survey.Matrix.R(i, j)!.Value, 9);
            Assert.Equal((long)oracle[(2 * k) + 1]!.Value, survey.Matrix.N(i, j));
            Assert.Equal(n, survey.Matrix.N(i, j));
        }

        // The holes are real: c05 lost every 7th row, c06 every 11th (NaN) and 13th (+∞), which DuckDB keeps.
        Assert.True(survey.Matrix.N(4, 5) < PlantedTable.Rows - 400);
        Assert.Contains(rows, r => r[5] is { } v && double.IsNaN(v));
    }

    private Task<TableSurvey> Survey(string table, int sampleRows, bool files = false) =>
        new DuckDbTableSurvey(new SourceConfig { Name = "lake", Kind = SourceKind.DuckDb, ConnectionString = files ? string.Empty : $"Data Source={_database}" })
            .SurveyAsync(new SurveyRequest(table, 60, sampleRows), null, CancellationToken.None);

    private static List<double?[]> Row(DuckDBConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        using var reader = command.ExecuteReader();
        var rows = new List<double?[]>();
        while (reader.Read())
        {
            rows.Add([.. Enumerable.Range(0, reader.FieldCount).Select(i => reader.IsDBNull(i) ? (double?)null : reader.GetDouble(i))]);
        }

        return rows;
    }

    private static void Execute(DuckDBConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        command.ExecuteNonQuery();
    }

    private static string Literal(double? value) => value switch
    {
        null => "NULL",
        { } v when double.IsNaN(v) => "'NaN'::DOUBLE",
        { } v when double.IsPositiveInfinity(v) => "'Infinity'::DOUBLE",
        { } v => v.ToString("R", CultureInfo.InvariantCulture),
    };
}
