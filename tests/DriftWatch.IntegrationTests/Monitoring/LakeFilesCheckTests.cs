using DuckDB.NET.Data;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>A duckdb pair over a Parquet glob (two files) through the check pass, like a PostgreSQL pair.</summary>
public sealed class LakeFilesCheckTests : IDisposable
{
    private readonly string _directory = Path.Combine(Path.GetTempPath(), "dw-lake-" + Guid.NewGuid().ToString("N"));

    public void Dispose() => Directory.Delete(_directory, recursive: true);

    [Fact]
    public async Task CopiedColumn_InParquetFiles_IsBecamePerfect_AsOnPostgres()
    {
        var parcels = Path.Combine(_directory, "parcels");
        Directory.CreateDirectory(parcels);
        // Two weighings of each parcel: a deterministic ±1 kg scale error around the declared weight.
        Write(parcels, "100 + (i * 37) % 900 + ((i * 7919) % 200 - 100) / 100.0");

        await PlantedCopyCheck.RunAsync(
            "    kind: duckdb",
            Path.Combine(parcels, "*.parquet"),
            () =>
            {
                Write(parcels, "100 + (i * 37) % 900");
                return Task.CompletedTask;
            });
    }

    private static void Write(string directory, string weighed)
    {
        using var connection = new DuckDBConnection("Data Source=:memory:");
        connection.Open();
        foreach (var (part, range) in new[] { ("part1", "range(1, 1001)"), ("part2", "range(1001, 2001)") })
        {
            using var command = connection.CreateCommand();
            command.CommandText = $"COPY (SELECT CAST(100 + (i * 37) % 900 AS DOUBLE) AS declared_kg, CAST({weighed} AS DOUBLE) AS weighed_kg FROM {range} t(i)) TO '{directory}/{part}.parquet' (FORMAT parquet)";
            command.ExecuteNonQuery();
        }
    }
}
