using System.Net.Sockets;
using MySqlConnector;

namespace DriftWatch.Sources.MySql;

/// <summary>
/// Maps MySqlConnector's exceptions to <see cref="SourceFailure"/> by the server's error number
/// (MySQL/MariaDB error reference); messages never carry the connection string.
/// </summary>
internal static class MySqlErrors
{
    // MariaDB's max_statement_time (no MySqlErrorCode name) and MySQL's max_execution_time.
    private const int MariaDbStatementTimeout = 1969;
    private const int MySqlQueryTimeout = 3024;

    public static SourceException Map(Exception exception, string subject, string endpoint, bool opening)
    {
        switch (exception)
        {
            case SourceException already:
                return already;
            case MySqlException my:
                return MapServer(my, subject, endpoint, opening);
            case SocketException or IOException or TimeoutException:
                return new SourceException(SourceFailure.Unreachable, $"{subject}: cannot reach MySQL at {endpoint}: {exception.Message}", exception);
            case InvalidCastException or FormatException or OverflowException:
                return new SourceException(SourceFailure.QueryError, $"{subject}: a value could not be read as a number ({exception.Message}).", exception);
            default:
                return new SourceException(opening ? SourceFailure.Unreachable : SourceFailure.QueryError, $"{subject}: {exception.GetType().Name}: {exception.Message}", exception);
        }
    }

    private static SourceException MapServer(MySqlException my, string subject, string endpoint, bool opening)
    {
        var text = my.Message;
        var number = my.Number;
        return my.ErrorCode switch
        {
            MySqlErrorCode.AccessDenied => new SourceException(SourceFailure.PermissionDenied, $"{subject}: login refused: {text}", my),
            MySqlErrorCode.UnknownDatabase when opening => new SourceException(SourceFailure.Unreachable, $"{subject}: MySQL at {endpoint} refused the session: {text}", my),
            MySqlErrorCode.NoSuchTable or MySqlErrorCode.UnknownDatabase => new SourceException(SourceFailure.MissingTable, $"{subject}: {text}", my),
            MySqlErrorCode.BadFieldError => new SourceException(SourceFailure.MissingColumn, $"{subject}: {text}", my),
            MySqlErrorCode.TableAccessDenied or MySqlErrorCode.ColumnAccessDenied or MySqlErrorCode.DatabaseAccessDenied =>
                new SourceException(SourceFailure.PermissionDenied, $"{subject}: {text}; grant the monitoring account SELECT on it.", my),
            MySqlErrorCode.CommandTimeoutExpired or MySqlErrorCode.QueryInterrupted =>
                new SourceException(SourceFailure.Timeout, $"{subject}: stopped by the statement timeout ({text}).", my),
            MySqlErrorCode.CannotExecuteInReadOnlyTransaction =>
                new SourceException(SourceFailure.QueryError, $"{subject}: the query tried to write, but DriftWatch reads through read-only transactions ({text}).", my),
            MySqlErrorCode.UnableToConnectToHost => new SourceException(SourceFailure.Unreachable, $"{subject}: cannot reach MySQL at {endpoint}: {text}", my),
            _ when number is MariaDbStatementTimeout or MySqlQueryTimeout =>
                new SourceException(SourceFailure.Timeout, $"{subject}: stopped by the statement timeout ({text}).", my),
            _ when opening => new SourceException(SourceFailure.Unreachable, $"{subject}: cannot open a session at {endpoint}: {text}", my),
            _ => new SourceException(SourceFailure.QueryError, $"{subject}: query failed ({number}): {text}", my),
        };
    }
}
