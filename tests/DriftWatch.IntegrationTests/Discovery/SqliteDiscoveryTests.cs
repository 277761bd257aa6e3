using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;
using DriftWatch.Core.Statistics;
using DriftWatch.IntegrationTests.Sources.Sqlite;
using DriftWatch.Sources;
using DriftWatch.Sources.Sqlite;
using Microsoft.Data.Sqlite;

namespace DriftWatch.IntegrationTests.Discovery;

/// <summary><c>discover</c> on a real SQLite file: the planted table of <see cref="PlantedTable"/>.</summary>
public sealed class SqliteDiscoveryTests : IDisposable
{
    private readonly SqliteFile _file = new();
    private readonly string _folder = Directory.CreateTempSubdirectory("dw-discover-").FullName;

    public SqliteDiscoveryTests()
    {
        _file.Execute(PlantedTable.CreateSql("REAL", Literal, PlantedTable.Generate()));
        _file.Execute("CREATE TABLE notes (title TEXT, body TEXT, amount REAL)");
    }

    public void Dispose()
    {
        _file.Dispose();
        Directory.Delete(_folder, recursive: true);
    }

    [Fact]
    public async Task Survey_Matrix_MatchesMathNetOnTheRowsReadBack()
    {
        var survey = await Survey(60);
        var rows = ReadBack();
        var columns = PlantedTable.Columns;
        for (var i = 0; i < columns.Length; i++)
        {
            for (var j = i + 1; j < columns.Length; j++)
            {
                // SQLite has no corr(): MathNet.Numerics over the pairwise-complete finite rows is the oracle.
                var (r, n) = PlantedTable.MathNetPearson(rows, i, j);
                Assert.Equal(r!.Value, survey.Matrix.R(i, j)!.Value, 9);
                Assert.Equal(n, survey.Matrix.N(i, j));
            }
        }

        Assert.Equal("all 2000", survey.Sample.Method);
    }

    [Fact]
    public async Task Survey_PlantedDerivations_AreFoundWithTheirEquations()
    {
        var survey = await Survey(60);
        var result = TableDiscovery.Assess(survey.Matrix, survey.Sample, 0.5, Thresholds.Default);

        var pounds = Assert.Single(result.Derivations, d => d.Column == "lb");
        Assert.Equal(("kg", DerivationKind.Affine), (pounds.From, pounds.Kind));
        Assert.Equal(PlantedTable.PoundsPerKilogram, pounds.Slope!.Value, 9);
        var sum = Assert.Single(result.Derivations, d => d.Column == "total");
        Assert.Equal(("net", "total = net + 4.5"), (sum.From, sum.Equation));
        Assert.Equal(2, result.Derivations.Count);
        Assert.Equal(("c01", "c02"), (result.Candidates[0].X, result.Candidates[0].Y));
        Assert.DoesNotContain(result.Candidates, c => c.X is "lb" or "total" || c.Y is "lb" or "total");
    }

    [Fact]
    public async Task Survey_ColumnBound_ReadsTheFirstColumnsAndNamesTheRest()
    {
        var survey = await Survey(10);
        Assert.Equal(PlantedTable.Columns.Take(10), survey.Matrix.Columns);
        Assert.Equal(20, survey.Selection.Skipped.Count);
        Assert.Contains("Skipped 20: c11, c12", survey.Selection.SkippedMessage(10), StringComparison.Ordinal);
    }

    [Fact]
    public async Task Cli_ProposedYaml_LoadsAndValidatesUnchanged_AndWriteAppendsToItsOwnFile()
    {
        var config = WriteConfig();
        var written = Path.Combine(_folder, "proposed.yaml");
        var (exit, yaml, error) = await PlantedTable.CliAsync("discover", "-c", config, "-s", "warehouse", "-t", "parcels", "--format", "yaml", "--write", written);
        Assert.True(exit == 0, error);
        Assert.Equal(yaml, await File.ReadAllTextAsync(written));

        var merged = Path.Combine(_folder, "merged.yaml");
        await File.WriteAllTextAsync(merged, await File.ReadAllTextAsync(config) + yaml);
        var validate = await PlantedTable.CliAsync("validate", "--config", merged);
        Assert.True(validate.Exit == 0, validate.Out + validate.Error);
        Assert.Contains("✓ parcels.lb_vs_kg", validate.Out, StringComparison.Ordinal);
        Assert.Contains("✓ parcels.c02_vs_c01", validate.Out, StringComparison.Ordinal);

        // A second run appends nothing it already proposed, and the configuration itself is never written.
        var again = await PlantedTable.CliAsync("discover", "-c", config, "-s", "warehouse", "-t", "parcels", "--write", written);
        Assert.Equal(0, again.Exit);
        var loaded = ConfigLoader.Load(merged, _ => null);
        Assert.True(loaded.Ok);
        Assert.DoesNotContain("-2\"", await File.ReadAllTextAsync(written), StringComparison.Ordinal);
        var before = await File.ReadAllTextAsync(config);
        var refused = await PlantedTable.CliAsync("discover", "-c", config, "-s", "warehouse", "-t", "parcels", "--write", config);
        Assert.Equal(2, refused.Exit);
        Assert.Contains("is the configuration file itself", refused.Error, StringComparison.Ordinal);
        Assert.Equal(before, await File.ReadAllTextAsync(config));
    }

    [Fact]
    public async Task Cli_BadInput_GivesClearErrors()
    {
        var config = WriteConfig();
        var source = await PlantedTable.CliAsync("discover", "-c", config, "-s", "warehous", "-t", "parcels");
        Assert.Equal((2, true), (source.Exit, source.Error.Contains("no source named 'warehous'", StringComparison.Ordinal) && source.Error.Contains("did you mean 'warehouse'?", StringComparison.Ordinal)));
        var table = await PlantedTable.CliAsync("discover", "-c", config, "-s", "warehouse", "-t", "parcel");
        Assert.Equal(2, table.Exit);
        Assert.Contains("no table or view parcel in source 'warehouse' (did you mean 'parcels'?)", table.Error, StringComparison.Ordinal);
        var text = await PlantedTable.CliAsync("discover", "-c", config, "-s", "warehouse", "-t", "notes");
        Assert.Equal(2, text.Exit);
        Assert.Contains("has only one numeric column (amount)", text.Error, StringComparison.Ordinal);
        Assert.Contains("title (TEXT)", text.Error, StringComparison.Ordinal);
    }

    private List<double?[]> ReadBack()
    {
        using var connection = new SqliteConnection($"Data Source={_file.Path};Mode=ReadOnly");
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = $"SELECT {string.Join(", ", PlantedTable.Columns)} FROM parcels";
        using var reader = command.ExecuteReader();
        var rows = new List<double?[]>();
        while (reader.Read())
        {
            rows.Add([.. Enumerable.Range(0, reader.FieldCount).Select(i => reader.IsDBNull(i) ? (double?)null : reader.GetDouble(i))]);
        }

        return rows;
    }

    private Task<TableSurvey> Survey(int maxColumns) =>
        new SqliteTableSurvey(new SourceConfig { Name = "warehouse", Kind = SourceKind.Sqlite, ConnectionString = $"Data Source={_file.Path}" })
            .SurveyAsync(new SurveyRequest("parcels", maxColumns, 10_000), null, CancellationToken.None);

    private string WriteConfig()
    {
        var path = Path.Combine(_folder, "driftwatch.yaml");
        File.WriteAllText(path, $"""
            sources:
              - name: warehouse
                kind: sqlite
                connection: "{_file.Path}"

            """);
        return path;
    }

    private static string Literal(double? value) => value switch
    {
        null => "NULL",
        { } v when double.IsNaN(v) => "NULL",
        { } v when double.IsPositiveInfinity(v) => "9e999",
        { } v => v.ToString("R", CultureInfo.InvariantCulture),
    };
}
