using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;
using DriftWatch.Core.Statistics;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources;
using DriftWatch.Sources.Postgres;

namespace DriftWatch.IntegrationTests.Discovery;

/// <summary><c>discover</c> on a real PostgreSQL: the planted table of <see cref="PlantedTable"/>.</summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresDiscoveryTests(PostgresServer server) : IAsyncLifetime
{
    private PostgresDatabase _db = null!;
    private string _folder = null!;

    public async Task InitializeAsync()
    {
        _db = await PostgresDatabase.CreateAsync(server);
        await _db.ExecuteAsync(PlantedTable.CreateSql("double precision", Literal, PlantedTable.Generate()) + "ANALYZE parcels;");
        _folder = Directory.CreateTempSubdirectory("dw-discover-").FullName;
    }

    public async Task DisposeAsync()
    {
        Directory.Delete(_folder, recursive: true);
        await _db.DisposeAsync();
    }

    [Fact]
    public async Task Survey_Matrix_MatchesTheEnginesCorrAndMathNetOnEveryPair()
    {
        var survey = await Survey();
        var columns = PlantedTable.Columns;
        Assert.Equal(columns, survey.Matrix.Columns);
        Assert.Equal(PlantedTable.Rows, survey.Sample.RowCount);

        // The engine's own corr() over the same pairwise-complete finite rows, every pair in one statement.
        var pairs = (from i in Enumerable.Range(0, columns.Length) from j in Enumerable.Range(i + 1, columns.Length - i - 1) select (i, j)).ToList();
        string Finite(string c) => $"{c} > '-Infinity'::float8 AND {c} < 'Infinity'::float8";
        var oracle = (await _db.RowsAsync("SELECT " + string.Join(", ", pairs.SelectMany(p =>
            new[] { $"corr({columns[p.j]}, {columns[p.i]}) FILTER (WHERE {Finite(columns[p.i])} AND {Finite(columns[p.j])})", $"count(*) FILTER (WHERE {Finite(columns[p.i])} AND {Finite(columns[p.j])})" })) + " FROM parcels"))[0];
        var rows = await _db.RowsAsync($"SELECT {string.Join(", ", columns)} FROM parcels");
        for (var k = 0; k < pairs.Count; k++)
        {
            var (i, j) = pairs[k];
            var engine = oracle[2 * k]!.Value;
            var (mathNet, n) = PlantedTable.MathNetPearson(rows, i, j);
            Assert.Equal(engine, survey.Matrix.R(i, j)!.Value, 9);
            Assert.Equal(mathNet!.Value, survey.Matrix.R(i, j)!.Value, 9);
            Assert.Equal((long)oracle[(2 * k) + 1]!.Value, survey.Matrix.N(i, j));
            Assert.Equal(n, survey.Matrix.N(i, j));
        }

        // The holes are real: c05 lost every 7th row, c06 every 11th (NaN) and 13th (+∞).
        Assert.True(survey.Matrix.N(4, 5) < PlantedTable.Rows - 400);
    }

    [Fact]
    public async Task Survey_PlantedDerivations_AreFoundWithTheirEquations()
    {
        var survey = await Survey();
        var result = TableDiscovery.Assess(survey.Matrix, survey.Sample, 0.5, Thresholds.Default);

        var pounds = Assert.Single(result.Derivations, d => d.Column == "lb");
        Assert.Equal(("kg", DerivationKind.Affine), (pounds.From, pounds.Kind));
        Assert.Equal(PlantedTable.PoundsPerKilogram, pounds.Slope!.Value, 9);
        Assert.StartsWith("lb = 2.2046226", pounds.Equation, StringComparison.Ordinal);
        var sum = Assert.Single(result.Derivations, d => d.Column == "total");
        Assert.Equal(("net", "total = net + 4.5"), (sum.From, sum.Equation));
        Assert.Equal(2, result.Derivations.Count);

        // The noisy relationships are candidates, strongest first; no pair of a derived column is offered as ordinary.
        Assert.Equal(("c01", "c02"), (result.Candidates[0].X, result.Candidates[0].Y));
        Assert.Contains(result.Candidates, c => (c.X, c.Y) == ("c03", "c04") && c.R < -0.5);
        Assert.Contains(result.Candidates, c => (c.X, c.Y) == ("c05", "c06"));
        Assert.DoesNotContain(result.Candidates, c => c.X is "lb" or "total" || c.Y is "lb" or "total");
    }

    [Fact]
    public async Task Cli_ProposedYaml_LoadsAndValidatesUnchangedUnderTheUsersPairs()
    {
        var config = WriteConfig();
        var (exit, yaml, error) = await PlantedTable.CliAsync("discover", "--config", config, "--source", "warehouse", "--table", "parcels", "--format", "yaml");
        Assert.True(exit == 0, error);
        Assert.Contains("discover: computing the correlation matrix of 30 columns (435 pairs", error, StringComparison.Ordinal);
        Assert.Contains("# lb = 2.2046226", yaml, StringComparison.Ordinal);
        Assert.Contains("# total = net + 4.5 on every row", yaml, StringComparison.Ordinal);

        // Pasted under the existing pairs: key as it is (the pairs: line of the block dropped, nothing else touched).
        var merged = Path.Combine(_folder, "merged.yaml");
        await File.WriteAllTextAsync(merged, await File.ReadAllTextAsync(config) + string.Join('\n', yaml.Split('\n').Where(l => l != "pairs:")));
        var loaded = ConfigLoader.Load(merged, _ => null);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));
        var pounds = Assert.Single(loaded.Config!.Pairs, p => p.Name == "parcels.lb_vs_kg");
        Assert.Equal(("kg", "lb", true), (pounds.X, pounds.Y, pounds.Declared.Exact));
        Assert.Contains(loaded.Config.Pairs, p => p.Name == "parcels.c02_vs_c01" && !p.Declared.Exact);

        var validate = await PlantedTable.CliAsync("validate", "--config", merged);
        Assert.True(validate.Exit == 0, validate.Out + validate.Error);
        Assert.Contains("✓ parcels.total_vs_net", validate.Out, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Survey_SlowView_IsStoppedByTheSourcesStatementTimeout()
    {
        // Each row of the view waits 50 ms: the first scan takes far longer than the source's 300 ms.
        await _db.ExecuteAsync("""
            CREATE FUNCTION slowly(v float8) RETURNS float8 LANGUAGE sql VOLATILE AS 'SELECT pg_sleep(0.05); SELECT v';
            CREATE VIEW slow_parcels AS SELECT slowly(kg) AS kg, lb FROM parcels;
            """);
        var survey = new PostgresTableSurvey(new SourceConfig
        {
            Name = "warehouse", Kind = SourceKind.Postgres, ConnectionString = _db.ConnectionString, StatementTimeout = TimeSpan.FromMilliseconds(300),
        });

        var failure = await Assert.ThrowsAsync<SourceException>(() => survey.SurveyAsync(new SurveyRequest("slow_parcels", 60, 1_000), null, CancellationToken.None));
        Assert.Equal(SourceFailure.Timeout, failure.Failure);
        Assert.StartsWith("Survey of table slow_parcels (source 'warehouse'): cancelled by the statement timeout", failure.Message, StringComparison.Ordinal);
    }

    private async Task<TableSurvey> Survey()
    {
        var survey = new PostgresTableSurvey(new SourceConfig { Name = "warehouse", Kind = SourceKind.Postgres, ConnectionString = _db.ConnectionString });
        return await survey.SurveyAsync(new SurveyRequest("parcels", 60, 10_000), null, CancellationToken.None);
    }

    private string WriteConfig()
    {
        var path = Path.Combine(_folder, "driftwatch.yaml");
        File.WriteAllText(path, $"""
            sources:
              - name: warehouse
                kind: postgres
                connection: "{_db.ConnectionString}"
            pairs:
              - name: kept
                source: warehouse
                table: parcels
                x: c01
                y: c03

            """);
        return path;
    }

    private static string Literal(double? value) => value switch
    {
        null => "NULL",
        { } v when double.IsNaN(v) => "'NaN'",
        { } v when double.IsPositiveInfinity(v) => "'Infinity'",
        { } v => v.ToString("R", CultureInfo.InvariantCulture),
    };
}
