namespace DriftWatch.Sources.Csv;

/// <summary>The cells of one column that held text instead of a number: how many, and the first of them.</summary>
/// <param name="Line">1-based line in the file where the first offending record starts (the header is line 1).</param>
internal sealed record CsvNonNumericCells(string SourceName, string Column, long Line, string FirstValue, int Count)
{
    /// <summary>"orders.csv:17: column 'y' value 'abc' is not a number (3 such cells)".</summary>
    public string Message =>
        $"{SourceName}:{Line}: column '{Column}' value '{Shorten(FirstValue)}' is not a number " +
        $"({Count} such {(Count == 1 ? "cell" : "cells")})";

    // A runaway cell (a quote never closed swallows the rest of the file) must not flood the terminal.
    private static string Shorten(string value) => value.Length <= 40 ? value : value[..37] + "...";
}
