using Microsoft.Data.Sqlite;

namespace DriftWatch.Sources.Sqlite;

/// <summary>Maps SQLite's result codes (sqlite.org/rescode.html) and its message texts to <see cref="SourceFailure"/>.</summary>
internal static class SqliteErrors
{
    private const int Busy = 5;
    private const int Locked = 6;
    private const int ReadOnly = 8;
    private const int Interrupt = 9;
    private const int CantOpen = 14;
    private const int Auth = 23;
    private const int NotADatabase = 26;

    public static SourceException Map(Exception exception, string pair, string source, string file, string target, bool timedOut)
    {
        return MapFor(exception, $"Pair '{pair}' (source '{source}', {target})", file, timedOut);
    }

    /// <summary>As <see cref="Map"/> for work that is not a pair's (a table survey): <paramref name="subject"/> opens the message.</summary>
    public static SourceException MapFor(Exception exception, string subject, string file, bool timedOut)
    {
        if (exception is SourceException already)
        {
            return already;
        }

        if (exception is not SqliteException sqlite)
        {
            return new SourceException(SourceFailure.QueryError, $"{subject}: {exception.GetType().Name}: {exception.Message}", exception);
        }

        var text = sqlite.Message.Replace("SQLite Error ", "error ", StringComparison.Ordinal);
        return sqlite.SqliteErrorCode switch
        {
            Interrupt when timedOut => new SourceException(SourceFailure.Timeout, $"{subject}: stopped by the statement timeout.", sqlite),
            Busy or Locked => new SourceException(SourceFailure.Timeout, $"{subject}: the database stayed locked by a writer ({text}).", sqlite),
            CantOpen or NotADatabase => new SourceException(SourceFailure.Unreachable, $"{subject}: cannot open SQLite database {file} ({text}).", sqlite),
            ReadOnly => new SourceException(SourceFailure.QueryError, $"{subject}: the query tried to write, but DriftWatch opens sources read-only ({text}).", sqlite),
            Auth => new SourceException(SourceFailure.PermissionDenied, $"{subject}: {text}.", sqlite),
            _ when sqlite.Message.Contains("no such table", StringComparison.OrdinalIgnoreCase) => new SourceException(SourceFailure.MissingTable, $"{subject}: {text}.", sqlite),
            _ when sqlite.Message.Contains("no such column", StringComparison.OrdinalIgnoreCase) => new SourceException(SourceFailure.MissingColumn, $"{subject}: {text}.", sqlite),
            _ when sqlite.Message.Contains("readonly", StringComparison.OrdinalIgnoreCase) || sqlite.Message.Contains("query_only", StringComparison.OrdinalIgnoreCase) =>
                new SourceException(SourceFailure.QueryError, $"{subject}: the query tried to write, but DriftWatch opens sources read-only ({text}).", sqlite),
            _ => new SourceException(SourceFailure.QueryError, $"{subject}: query failed: {text}.", sqlite),
        };
    }
}
