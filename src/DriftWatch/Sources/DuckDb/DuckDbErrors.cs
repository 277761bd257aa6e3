using DuckDB.NET.Data;
using DuckDB.NET.Native;

namespace DriftWatch.Sources.DuckDb;

/// <summary>Maps DuckDB's error types (and, where one type covers several cases, its message texts) to <see cref="SourceFailure"/>.</summary>
internal static class DuckDbErrors
{
    public static SourceException Map(Exception exception, string subject, string database, bool opening, bool timedOut)
    {
        if (exception is SourceException already)
        {
            return already;
        }

        if (timedOut && exception is OperationCanceledException or DuckDBException)
        {
            return new SourceException(SourceFailure.Timeout, $"{subject}: stopped by the statement timeout.", exception);
        }

        if (exception is not DuckDBException duck)
        {
            return new SourceException(opening ? SourceFailure.Unreachable : SourceFailure.QueryError, $"{subject}: {exception.GetType().Name}: {exception.Message}", exception);
        }

        // DuckDB appends the statement and a caret ("LINE 1: DESCRIBE SELECT … FROM read_parquet('…')"): the SQL DriftWatch
        // built around the pair. It helps to find a syntax error in a filter; a missing file, table or column is said
        // in full before it, so those messages end there.
        var text = duck.Message;
        var brief = WithoutStatement(text);
        if (opening)
        {
            // A missing file (read-only opens never create one), a lock held by a writer, not a database file.
            return new SourceException(SourceFailure.Unreachable, $"{subject}: cannot open DuckDB database {database} ({text}).", duck);
        }

        // DuckDB names the error class at the start of its message ("Catalog Error: …"); the error type is not always set.
        bool Is(DuckDBErrorType type, string prefix) => duck.ErrorType == type || text.StartsWith(prefix, StringComparison.Ordinal);
        if (Is(DuckDBErrorType.Catalog, "Catalog Error"))
        {
            return new SourceException(SourceFailure.MissingTable, $"{subject}: {brief}", duck);
        }

        if (Is(DuckDBErrorType.Binder, "Binder Error") && text.Contains("column", StringComparison.OrdinalIgnoreCase) && text.Contains("not found", StringComparison.OrdinalIgnoreCase))
        {
            return new SourceException(SourceFailure.MissingColumn, $"{subject}: {brief}", duck);
        }

        if (Is(DuckDBErrorType.Io, "IO Error") && (text.Contains("No files found", StringComparison.OrdinalIgnoreCase) || text.Contains("No such file", StringComparison.OrdinalIgnoreCase)))
        {
            return new SourceException(SourceFailure.MissingTable, $"{subject}: {brief}", duck);
        }

        if (Is(DuckDBErrorType.Permission, "Permission Error"))
        {
            return new SourceException(SourceFailure.PermissionDenied, $"{subject}: {brief}", duck);
        }

        return text.Contains("read-only mode", StringComparison.OrdinalIgnoreCase)
            ? new SourceException(SourceFailure.QueryError, $"{subject}: the query tried to write, but DriftWatch opens DuckDB databases read-only ({text}).", duck)
            : new SourceException(SourceFailure.QueryError, $"{subject}: query failed: {text}", duck);
    }

    /// <summary>The message up to DuckDB's statement context, on one line (a hint such as "Candidate bindings: …" follows a line break).</summary>
    private static string WithoutStatement(string message)
    {
        var at = message.IndexOf("\nLINE ", StringComparison.Ordinal);
        var text = at < 0 ? message : message[..at];
        return string.Join(' ', text.Split(['\r', '\n'], StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries));
    }
}
