using System.Net.Sockets;
using Npgsql;

namespace DriftWatch.Sources.Postgres;

/// <summary>
/// Turns what Npgsql throws into a <see cref="SourceException"/> whose message names the pair and what it
/// reads. Messages are built from SQLSTATE and the server's message text, never from the connection string.
/// </summary>
internal static class PostgresErrors
{
    public static SourceException Map(Exception exception, string pair, string source, string endpoint, string? target)
    {
        var subject = target is null ? $"Pair '{pair}' (source '{source}')" : $"Pair '{pair}' (source '{source}', {target})";
        return MapFor(exception, subject, endpoint, target is not null);
    }

    /// <summary>As <see cref="Map"/> for work that is not a pair's (a table survey): <paramref name="subject"/> opens the message.</summary>
    /// <param name="afterConnect">The session was open, so a client timeout is the statement's, not the connection's.</param>
    public static SourceException MapFor(Exception exception, string subject, string endpoint, bool afterConnect)
    {
        switch (exception)
        {
            case SourceException already:
                return already;
            case PostgresException pg:
                return MapServerError(pg, subject, endpoint);
            case NpgsqlException { InnerException: TimeoutException } when afterConnect:
                return new SourceException(SourceFailure.Timeout, $"{subject}: no answer within the command timeout.", exception);
            case NpgsqlException npgsql:
                var reason = npgsql.InnerException switch
                {
                    SocketException socket => socket.Message,
                    TimeoutException => "connection attempt timed out",
                    IOException io => io.Message,
                    _ => "connection failed",
                };
                return new SourceException(SourceFailure.Unreachable, $"{subject}: cannot reach PostgreSQL at {endpoint}: {reason}.", exception);
            case SocketException socket:
                return new SourceException(SourceFailure.Unreachable, $"{subject}: cannot reach PostgreSQL at {endpoint}: {socket.Message}.", exception);
            case InvalidCastException or FormatException or OverflowException:
                return new SourceException(SourceFailure.QueryError, $"{subject}: a value could not be read as a number ({exception.Message}).", exception);
            default:
                return new SourceException(SourceFailure.QueryError, $"{subject}: {exception.GetType().Name}: {exception.Message}", exception);
        }
    }

    private static SourceException MapServerError(PostgresException pg, string subject, string endpoint)
    {
        var text = pg.MessageText;
        return pg.SqlState switch
        {
            PostgresErrorCodes.UndefinedTable or PostgresErrorCodes.InvalidSchemaName =>
                new SourceException(SourceFailure.MissingTable, $"{subject}: {text}.", pg),
            PostgresErrorCodes.UndefinedColumn =>
                new SourceException(SourceFailure.MissingColumn, $"{subject}: {text}.", pg),
            PostgresErrorCodes.InsufficientPrivilege =>
                new SourceException(SourceFailure.PermissionDenied, $"{subject}: {text}; grant the monitoring role SELECT on it.", pg),
            PostgresErrorCodes.InvalidPassword or PostgresErrorCodes.InvalidAuthorizationSpecification =>
                new SourceException(SourceFailure.PermissionDenied, $"{subject}: login refused: {text}.", pg),
            PostgresErrorCodes.QueryCanceled =>
                new SourceException(SourceFailure.Timeout, $"{subject}: cancelled by the statement timeout ({text}).", pg),
            PostgresErrorCodes.ReadOnlySqlTransaction =>
                new SourceException(SourceFailure.QueryError, $"{subject}: the query tried to write, but DriftWatch reads through read-only sessions ({text}).", pg),
            PostgresErrorCodes.InvalidCatalogName or PostgresErrorCodes.TooManyConnections or PostgresErrorCodes.CannotConnectNow
                or PostgresErrorCodes.AdminShutdown or PostgresErrorCodes.CrashShutdown =>
                new SourceException(SourceFailure.Unreachable, $"{subject}: PostgreSQL at {endpoint} refused the session: {text}.", pg),
            _ when pg.SqlState.StartsWith("08", StringComparison.Ordinal) =>
                new SourceException(SourceFailure.Unreachable, $"{subject}: connection to {endpoint} failed: {text}.", pg),
            _ => new SourceException(SourceFailure.QueryError, $"{subject}: query failed ({pg.SqlState}): {text}.", pg),
        };
    }
}
