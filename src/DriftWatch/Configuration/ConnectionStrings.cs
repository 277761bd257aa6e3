using System.Data.Common;
using Microsoft.Data.Sqlite;
using MySqlConnector;
using Npgsql;

namespace DriftWatch.Configuration;

/// <summary>
/// Checks and completes connection strings with the drivers' own builders. Every message here is about the
/// string's shape or a keyword's name; none repeats a value, since the string is a secret.
/// </summary>
internal static class ConnectionStrings
{
    /// <summary>The resolved PostgreSQL connection string, with <paramref name="password"/> set as its password when given.</summary>
    public static string? Postgres(string text, string? password, out string? problem)
    {
        problem = null;
        var builder = new NpgsqlConnectionStringBuilder();
        try
        {
            builder.ConnectionString = text;
        }
        catch (ArgumentException ex)
        {
            // Npgsql names the keyword it could not set in ParamName; its message for a malformed string
            // gives only an index. Neither carries a value.
            problem = ex.ParamName is { Length: > 0 } keyword && !string.Equals(keyword, "connectionString", StringComparison.OrdinalIgnoreCase)
                ? $"is not a valid PostgreSQL connection string: the setting '{keyword}' is unknown or its value is invalid (value hidden)"
                : "is not a valid PostgreSQL connection string; write Key=value pairs separated by ';' (value hidden)";
            return null;
        }

        if (string.IsNullOrWhiteSpace(builder.Host))
        {
            problem = "is a PostgreSQL connection string without Host (value hidden)";
            return null;
        }

        if (password is not null)
        {
            if (!string.IsNullOrEmpty(builder.Password))
            {
                problem = "has a Password and password_file is given too; keep one of them (value hidden)";
                return null;
            }

            builder.Password = password;
        }

        return builder.ConnectionString;
    }

    /// <summary>
    /// A SQLite connection string, or a bare file path taken as its Data Source. A relative path resolves
    /// against <paramref name="baseDirectory"/> so the service finds the same file whatever its working directory.
    /// </summary>
    public static string? Sqlite(string text, string baseDirectory, out string? problem)
    {
        problem = null;
        var connection = text.Contains('=', StringComparison.Ordinal) ? text : $"Data Source={text}";
        SqliteConnectionStringBuilder builder;
        try
        {
            builder = new SqliteConnectionStringBuilder(connection);
        }
        catch (ArgumentException ex)
        {
            problem = ex.ParamName is { Length: > 0 } keyword && !string.Equals(keyword, "connectionString", StringComparison.OrdinalIgnoreCase)
                ? $"is not a valid SQLite connection string: the setting '{keyword}' is unknown or its value is invalid"
                : "is not a valid SQLite connection string; write a file path or Data Source=path";
            return null;
        }

        var source = builder.DataSource;
        if (string.IsNullOrWhiteSpace(source))
        {
            problem = "names no SQLite file; write a file path or Data Source=path";
            return null;
        }

        var keepAsWritten = builder.Mode == SqliteOpenMode.Memory
            || source == ":memory:"
            || source.StartsWith("file:", StringComparison.OrdinalIgnoreCase);
        if (!keepAsWritten)
        {
            builder.DataSource = Path.GetFullPath(source, baseDirectory);
        }

        return builder.ConnectionString;
    }

    /// <summary>The resolved MySqlConnector connection string, with <paramref name="password"/> set when given. It must name a Server.</summary>
    public static string? MySql(string text, string? password, out string? problem)
    {
        problem = null;
        MySqlConnectionStringBuilder builder;
        try
        {
            builder = new MySqlConnectionStringBuilder(text);
        }
        catch (ArgumentException)
        {
            // MySqlConnector's messages may quote the value; say only what shape is wanted.
            problem = "is not a valid MySQL connection string; write Key=value pairs separated by ';' such as Server=db;Database=shop;User ID=reader (value hidden)";
            return null;
        }

        if (string.IsNullOrWhiteSpace(builder.Server))
        {
            problem = "is a MySQL connection string without Server (value hidden)";
            return null;
        }

        if (password is not null)
        {
            if (!string.IsNullOrEmpty(builder.Password))
            {
                problem = "has a Password and password_file is given too; keep one of them (value hidden)";
                return null;
            }

            builder.Password = password;
        }

        return builder.ConnectionString;
    }

    /// <summary>
    /// A DuckDB database file (a path or Data Source=path, relative to <paramref name="baseDirectory"/>), or
    /// :memory: for pairs that read Parquet/CSV files only. The adapter adds ACCESS_MODE=READ_ONLY itself.
    /// </summary>
    public static string? DuckDb(string text, string baseDirectory, out string? problem)
    {
        problem = null;
        var builder = new DbConnectionStringBuilder();
        try
        {
            builder.ConnectionString = text.Contains('=', StringComparison.Ordinal) ? text : $"Data Source={text}";
        }
        catch (ArgumentException)
        {
            problem = "is not a valid DuckDB connection string; write a file path or Data Source=path";
            return null;
        }

        var key = builder.Keys.Cast<string>().FirstOrDefault(k => k.Replace(" ", string.Empty, StringComparison.Ordinal).Equals("DataSource", StringComparison.OrdinalIgnoreCase));
        var source = key is null ? null : Convert.ToString(builder[key], System.Globalization.CultureInfo.InvariantCulture);
        if (key is null || string.IsNullOrWhiteSpace(source))
        {
            problem = "names no DuckDB file; write a file path or Data Source=path (or leave connection out to read Parquet/CSV files only)";
            return null;
        }

        if (source != ":memory:")
        {
            builder[key] = Path.GetFullPath(source, baseDirectory);
        }

        return builder.ConnectionString;
    }
}
