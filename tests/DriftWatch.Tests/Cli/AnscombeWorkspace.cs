using System.Globalization;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// A temp folder with a SQLite source table holding Anscombe's quartet, set I (Anscombe 1973, "Graphs in
/// statistical analysis"; the published eleven rows, read from Data/anscombe_set1.csv), a configuration watching
/// it under a long dotted pair name, and a SQLite store. For CLI tests of what the commands print.
/// </summary>
internal sealed class AnscombeWorkspace : IDisposable
{
    /// <summary>Longer than a terminal's 80 columns on its own, with dots and underscores as real names have.</summary>
    public const string PairName = "warehouse_north.evening_shift.daily_shipments_total_vs_daily_pallets_loaded_by_crew";

    public AnscombeWorkspace()
    {
        Directory.CreateDirectory(Folder);
        using (var connection = new SqliteConnection($"Data Source={Path.Combine(Folder, "floor.db")}"))
        {
            connection.Open();
            using var create = connection.CreateCommand();
            create.CommandText = "CREATE TABLE shipments (pallets_loaded_by_evening_crew REAL, shipments_total_of_the_day REAL)";
            create.ExecuteNonQuery();
            foreach (var line in File.ReadLines(TestData.Path("anscombe_set1.csv")).Skip(1))
            {
                var parts = line.Split(',');
                using var insert = connection.CreateCommand();
                insert.CommandText = "INSERT INTO shipments VALUES ($x, $y)";
                insert.Parameters.AddWithValue("$x", double.Parse(parts[0], CultureInfo.InvariantCulture));
                insert.Parameters.AddWithValue("$y", double.Parse(parts[1], CultureInfo.InvariantCulture));
                insert.ExecuteNonQuery();
            }
        }

        File.WriteAllText(ConfigPath, $"""
            sources:
              - name: floor
                kind: sqlite
                connection: floor.db
            store:
              connection: store.db
            pairs:
              - name: {PairName}
                source: floor
                table: shipments
                x: pallets_loaded_by_evening_crew
                y: shipments_total_of_the_day
                sample:
                  method: all
            """);
    }

    public string Folder { get; } = Path.Combine(Path.GetTempPath(), "dw-cli-" + Guid.NewGuid().ToString("N"));

    public string ConfigPath => Path.Combine(Folder, "driftwatch.yaml");

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(Folder, recursive: true);
    }
}
