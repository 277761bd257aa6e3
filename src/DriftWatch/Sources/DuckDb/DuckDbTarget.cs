namespace DriftWatch.Sources.DuckDb;

/// <summary>
/// What a DuckDB pair's <c>table</c> names: a table of the database file, or Parquet/CSV files by path or
/// glob (<c>data/events/*.parquet</c>), read with <c>read_parquet</c> or <c>read_csv_auto</c>. A value is a
/// path when it holds a slash or a wildcard, or ends in .parquet, .csv, .tsv (optionally .gz). The path goes
/// into the SQL as a string literal (quotes doubled), never as an identifier.
/// </summary>
internal static class DuckDbTarget
{
    private static readonly string[] CsvEndings = [".csv", ".tsv", ".csv.gz", ".tsv.gz", ".txt"];

    public static bool IsFile(string? table) =>
        table is not null
        && (table.Contains('/', StringComparison.Ordinal) || table.Contains('*', StringComparison.Ordinal) || table.Contains('?', StringComparison.Ordinal)
            || table.EndsWith(".parquet", StringComparison.OrdinalIgnoreCase) || CsvEndings.Any(e => table.EndsWith(e, StringComparison.OrdinalIgnoreCase)));

    /// <summary>Why a file path cannot be read, or null.</summary>
    public static string? PathProblem(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        path = path.Trim();
        if (path.Length == 0 || path.Any(char.IsControl))
        {
            return $"file path '{path}' is empty or contains a control character";
        }

        // Remote files would need the httpfs extension and network access; DriftWatch reads local files only.
        return path.Contains("://", StringComparison.Ordinal) ? $"file path '{path}' is a URL; a duckdb source reads local files only" : null;
    }

    /// <summary>The FROM item reading the files; an <see cref="ArgumentException"/> for a path DuckDB must not see.</summary>
    public static string FileScan(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        path = path.Trim();
        if (PathProblem(path) is { } problem)
        {
            throw new ArgumentException(char.ToUpperInvariant(problem[0]) + problem[1..] + ".", nameof(path));
        }

        var literal = "'" + path.Replace("'", "''", StringComparison.Ordinal) + "'";
        var csv = CsvEndings.Any(e => path.EndsWith(e, StringComparison.OrdinalIgnoreCase));
        return csv ? $"read_csv_auto({literal})" : $"read_parquet({literal})";
    }
}
