using System.Globalization;
using System.Text;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>
/// The configuration the cycle benchmark loads: one PostgreSQL source, a SQLite store next to the file, and
/// <c>pairs</c> column pairs spread round-robin over the tables (pair k: table k mod T, the (k div T)-th column
/// combination), every one with 10 000-row samples and <c>method: auto</c>. The connection string comes from
/// the environment, as in a real deployment.
/// </summary>
internal static class CycleConfigYaml
{
    public const string ConnectionVariable = "DRIFTWATCH_BENCH_CYCLE_SOURCE";

    /// <param name="maxConcurrentQueries">Written only when given, so the default case reads the default.</param>
    /// <param name="window">A window such as "1d" on <c>ts</c>, or null for whole-table pairs.</param>
    public static string Build(int pairs, int tables, int? maxConcurrentQueries, string? window)
    {
        var combinations = Combinations(CycleTables.Columns);
        var perTable = (pairs + tables - 1) / tables;
        if (perTable > combinations.Count)
        {
            throw new ArgumentOutOfRangeException(nameof(pairs), pairs, $"{tables} tables of {CycleTables.Columns} columns give at most {tables * combinations.Count} pairs");
        }

        var yaml = new StringBuilder();
        yaml.AppendLine(CultureInfo.InvariantCulture, $$"""
            sources:
              - name: bench
                kind: postgres
                connection: ${{{ConnectionVariable}}}
            """);
        if (maxConcurrentQueries is { } max)
        {
            yaml.AppendLine(CultureInfo.InvariantCulture, $"    max_concurrent_queries: {max}");
        }

        // first_runs: 1 so that from the second cycle on every check compares with a baseline, as in a worker
        // that has been running for a while; the warm-up cycle builds the baselines.
        yaml.AppendLine("""
            store:
              kind: sqlite
              connection: store.db
            defaults:
              sample:
                rows: 10000
                method: auto
              baseline:
                first_runs: 1
            pairs:
            """);
        for (var k = 0; k < pairs; k++)
        {
            var table = CycleTables.TableName(k % tables);
            var (x, y) = combinations[k / tables];
            var xName = CycleTables.ColumnName(x);
            var yName = CycleTables.ColumnName(y);
            yaml.AppendLine(CultureInfo.InvariantCulture, $"""
                  - name: {table}-{xName}-{yName}
                    source: bench
                    table: {table}
                    x: {xName}
                    y: {yName}
                """);
            if (window is not null)
            {
                yaml.AppendLine(CultureInfo.InvariantCulture, $"    window: {{column: ts, last: {window}}}");
            }
        }

        return yaml.ToString();
    }

    private static List<(int X, int Y)> Combinations(int columns)
    {
        var list = new List<(int, int)>();
        for (var a = 0; a < columns; a++)
        {
            for (var b = a + 1; b < columns; b++)
            {
                list.Add((a, b));
            }
        }

        return list;
    }
}
