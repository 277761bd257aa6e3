using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;
using DriftWatch.Core.Statistics;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources;
using DriftWatch.Sources.MySql;
using MySqlConnector;

namespace DriftWatch.IntegrationTests.Discovery;

/// <summary>
/// <c>discover</c> on a real MariaDB: the planted table of <see cref="PlantedTable"/> in a database of its own.
/// DOUBLE holds no NaN or infinity there, so those values of c06 are stored as NULL (as SQLite stores NaN).
/// </summary>
[Collection(UsesMariaDb.Name)]
public sealed class MySqlDiscoveryTests(MariaDbServer server) : IAsyncLifetime
{
    private string _db = null!;
    private string _folder = null!;

    public async Task InitializeAsync()
    {
        _db = await server.CreateDatabaseAsync();
        await MariaDbServer.ExecuteAsync(_db, PlantedTable.CreateSql("DOUBLE", Literal, PlantedTable.Generate()));
        await MariaDbServer.ExecuteAsync(_db, "CREATE TABLE notes (title TEXT, body TEXT, amount DOUBLE)");
        _folder = Directory.CreateTempSubdirectory("dw-discover-maria-").FullName;
    }

    public async Task DisposeAsync()
    {
        Directory.Delete(_folder, recursive: true);
        await server.DropDatabaseAsync(_db);
    }

    [Fact]
    public async Task Survey_Matrix_MatchesTheEnginesAggregatesAndMathNetOnEveryPair()
    {
        var survey = await Survey(10_000);
        var columns = PlantedTable.Columns;
        Assert.Equal(columns, survey.Matrix.Columns);
        Assert.Equal("all 2000", survey.Sample.Method);

        // MariaDB has no corr(): the oracle is r = (avg(xy) − avg(x)·avg(y)) / (stddev_pop(x)·stddev_pop(y)) from the
        // engine's own AVG and STDDEV_POP over the rows where both values are present (the population form of Pearson's r).
        var pairs = (from i in Enumerable.Range(0, columns.Length) from j in Enumerable.Range(i + 1, columns.Length - i - 1) select (i, j)).ToList();
        var oracle = new List<double?>();
        foreach (var chunk in pairs.Chunk(100))
        {
            oracle.AddRange((await RowsAsync(OracleSql(chunk)))[0]);
        }

        var rows = await RowsAsync($"SELECT {string.Join(", ", columns)} FROM parcels");
        for (var k = 0; k < pairs.Count; k++)
        {
            var (i, j) = pairs[k];
            var (mathNet, n) = PlantedTable.MathNetPearson(rows, i, j);
            Assert.Equal(oracle[2 * k]!.Value, survey.Matrix.R(i, j)!.Value, 9);
            Assert.Equal(mathNet!.Value, survey.Matrix.R(i, j)!.Value, 9);
            Assert.Equal((long)oracle[(2 * k) + 1]!.Value, survey.Matrix.N(i, j));
            Assert.Equal(n, survey.Matrix.N(i, j));
        }

        Assert.True(survey.Matrix.N(4, 5) < PlantedTable.Rows - 400);
    }

    [Fact]
    public async Task Survey_PlantedDerivations_AreFoundWithTheirEquations()
    {
        var survey = await Survey(10_000);
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

    [Fact]
    public async Task Survey_LargeTable_KeepsRowsByAFilterThenCutsToExactlyThatManyWholeRows()
    {
        // 60,000 rows (MariaDB's sequence engine), above the 50,000 read whole: the shared sample is drawn, rows stay whole.
        await MariaDbServer.ExecuteAsync(_db, $"CREATE TABLE crates AS SELECT CAST(1 + seq % 397 AS DOUBLE) AS kg, (1 + seq % 397) * {PlantedTable.PoundsPerKilogram.ToString("R", CultureInfo.InvariantCulture)}e0 AS lb FROM seq_1_to_60000");
        var survey = await new MySqlTableSurvey(new SourceConfig { Name = "shop", Kind = SourceKind.MySql, ConnectionString = _db })
            .SurveyAsync(new SurveyRequest("crates", 60, 500), null, CancellationToken.None);
        Assert.StartsWith("random filter ", survey.Sample.Method, StringComparison.Ordinal);
        Assert.EndsWith("% 500", survey.Sample.Method, StringComparison.Ordinal);
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
              - name: shop
                kind: mysql
            {MySqlSourceYaml.Lines(_db, _folder, "mysql.secret")}

            """);
        var (exit, yaml, error) = await PlantedTable.CliAsync("discover", "--config", config, "--source", "shop", "--table", "parcels", "--format", "yaml");
        Assert.True(exit == 0, error);
        Assert.Contains("# total = net + 4.5 on every row", yaml, StringComparison.Ordinal);

        var merged = Path.Combine(_folder, "merged.yaml");
        await File.WriteAllTextAsync(merged, await File.ReadAllTextAsync(config) + yaml);
        var loaded = ConfigLoader.Load(merged, _ => null);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));
        var pounds = Assert.Single(loaded.Config!.Pairs, p => p.Name == "parcels.lb_vs_kg");
        Assert.Equal(("shop", "kg", "lb", true), (pounds.Source, pounds.X, pounds.Y, pounds.Declared.Exact));
        var validate = await PlantedTable.CliAsync("validate", "--config", merged);
        Assert.True(validate.Exit == 0, validate.Out + validate.Error);
        Assert.Contains("✓ parcels.total_vs_net", validate.Out, StringComparison.Ordinal);

        var missing = await PlantedTable.CliAsync("discover", "--config", config, "--source", "shop", "--table", "parcel");
        Assert.Equal(2, missing.Exit);
        Assert.Contains("no table or view parcel in source 'shop' (did you mean 'parcels'?)", missing.Error, StringComparison.Ordinal);
        var text = await PlantedTable.CliAsync("discover", "--config", config, "--source", "shop", "--table", "notes");
        Assert.Equal(2, text.Exit);
        Assert.Contains("has only one numeric column (amount)", text.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Survey_SlowView_IsStoppedByTheServersStatementTimeout()
    {
        // Each row of the view sleeps 50 ms: the first scan takes far longer than the source's 300 ms.
        await MariaDbServer.ExecuteAsync(_db, "CREATE VIEW slow_parcels AS SELECT kg + SLEEP(0.05) AS kg, lb FROM parcels");
        var survey = new MySqlTableSurvey(new SourceConfig
        {
            Name = "shop", Kind = SourceKind.MySql, ConnectionString = _db, StatementTimeout = TimeSpan.FromMilliseconds(300),
        });

        var failure = await Assert.ThrowsAsync<SourceException>(() => survey.SurveyAsync(new SurveyRequest("slow_parcels", 60, 1_000), null, CancellationToken.None));
        Assert.Equal(SourceFailure.Timeout, failure.Failure);
        Assert.StartsWith("Survey of table slow_parcels (source 'shop'): stopped by the statement timeout", failure.Message, StringComparison.Ordinal);
    }

    private Task<TableSurvey> Survey(int sampleRows) =>
        new MySqlTableSurvey(new SourceConfig { Name = "shop", Kind = SourceKind.MySql, ConnectionString = _db })
            .SurveyAsync(new SurveyRequest("parcels", 60, sampleRows), null, CancellationToken.None);

    /// <summary>For each pair, r and n from the engine's aggregates over the rows where both values are present.</summary>
    private static string OracleSql((int i, int j)[] pairs)
    {
        var columns = PlantedTable.Columns;
        var terms = pairs.SelectMany(p =>
        {
            string Both(string e) => $"CASE WHEN {columns[p.i]} IS NOT NULL AND {columns[p.j]} IS NOT NULL THEN {e} END";
            string x = Both(columns[p.i]), y = Both(columns[p.j]);
            return new[]
            {
                $"(AVG({x} * {y}) - AVG({x}) * AVG({y})) / (STDDEV_POP({x}) * STDDEV_POP({y}))",
                $"COUNT({Both("1")})",
            };
        });
        return $"SELECT {string.Join(", ", terms)} FROM parcels";
    }

    private async Task<List<double?[]>> RowsAsync(string sql)
    {
        await using var connection = new MySqlConnection(_db);
        await connection.OpenAsync();
        await using var command = new MySqlCommand(sql, connection);
        await using var reader = await command.ExecuteReaderAsync();
        var rows = new List<double?[]>();
        while (await reader.ReadAsync())
        {
            rows.Add([.. Enumerable.Range(0, reader.FieldCount).Select(i => reader.IsDBNull(i) ? (double?)null : Convert.ToDouble(reader.GetValue(i), CultureInfo.InvariantCulture))]);
        }

        return rows;
    }

    private static string Literal(double? value) => value switch
    {
        null => "NULL",
        { } v when !double.IsFinite(v) => "NULL",
        { } v => v.ToString("R", CultureInfo.InvariantCulture),
    };
}
