using DuckDB.NET.Data;

namespace DriftWatch.IntegrationTests.Infrastructure;

/// <summary>Parquet files written by DuckDB's own <c>COPY (…) TO '…' (FORMAT parquet)</c>, one file per SELECT.</summary>
internal static class ParquetFiles
{
    /// <summary>Writes <c>part1.parquet</c>, <c>part2.parquet</c>, … into <paramref name="directory"/> (created), replacing what is there.</summary>
    public static void Write(string directory, params string[] selects)
    {
        Directory.CreateDirectory(directory);
        using var connection = new DuckDBConnection("Data Source=:memory:");
        connection.Open();
        for (var i = 0; i < selects.Length; i++)
        {
            var file = Path.Combine(directory, $"part{i + 1}.parquet").Replace("'", "''", StringComparison.Ordinal);
            using var command = connection.CreateCommand();
            command.CommandText = $"COPY ({selects[i]}) TO '{file}' (FORMAT parquet)";
            command.ExecuteNonQuery();
        }
    }

    /// <summary>One value from DuckDB over the files (the engine's own aggregates as an oracle).</summary>
    public static double Scalar(string sql)
    {
        using var connection = new DuckDBConnection("Data Source=:memory:");
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        return Convert.ToDouble(command.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture);
    }
}
