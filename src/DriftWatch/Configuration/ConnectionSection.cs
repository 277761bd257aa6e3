using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary>The <c>connection</c> and <c>password_file</c> keys a source and the store share.</summary>
internal static class ConnectionSection
{
    /// <summary>The resolved connection string, or null (reported). <paramref name="sqliteDefault"/> applies when the key is absent.</summary>
    public static string? Read(MappingReader reader, bool postgres, string? sqliteDefault) =>
        Read(reader, postgres ? SourceKind.Postgres : SourceKind.Sqlite, sqliteDefault, "applies to postgres connections only");

    /// <summary>As above for a source of any kind: mysql takes a password file like postgres; duckdb needs no connection (files only).</summary>
    public static string? Read(MappingReader reader, SourceKind kind, string? sqliteDefault, string passwordFileScope = "applies to postgres and mysql connections only")
    {
        var postgres = kind == SourceKind.Postgres;
        var takesPassword = kind is SourceKind.Postgres or SourceKind.MySql;
        var passwordFile = reader.Text("password_file");
        var text = reader.Text("connection", secret: true);
        var usable = true;
        string? password = null;
        if (passwordFile is not null)
        {
            if (!takesPassword)
            {
                reader.Error("password_file", passwordFileScope);
                usable = false;
            }
            else
            {
                password = SecretFiles.Read(reader.Context.ResolvePath(passwordFile), out var fileProblem);
                if (password is null && reader.Context.Offline)
                {
                    reader.Context.SkipOffline(reader.KeyPath("password_file"), fileProblem + "; not checked offline");
                }
                else if (password is null)
                {
                    reader.Error("password_file", fileProblem!);
                    usable = false;
                }
            }
        }

        if (text is null && reader.Has("connection"))
        {
            // Present but unreadable (an unset variable): already reported.
            return null;
        }

        if (text is null && kind == SourceKind.DuckDb)
        {
            // No database file: the pairs read Parquet or CSV files through an in-memory database.
            text = ":memory:";
        }

        if (text is null)
        {
            if (takesPassword || sqliteDefault is null)
            {
                reader.Missing("connection", kind switch
                {
                    SourceKind.Postgres => "is required: an Npgsql connection string such as Host=db;Database=shop;Username=reader",
                    SourceKind.MySql => "is required: a MySqlConnector connection string such as Server=db;Database=shop;User ID=reader",
                    _ => "is required: a SQLite file path or Data Source=path",
                });
                return null;
            }

            text = sqliteDefault;
        }

        string? problem;
        var resolved = kind switch
        {
            SourceKind.Postgres => ConnectionStrings.Postgres(text, password, out problem),
            SourceKind.MySql => ConnectionStrings.MySql(text, password, out problem),
            SourceKind.DuckDb => ConnectionStrings.DuckDb(text, reader.Context.BaseDirectory, out problem),
            _ => ConnectionStrings.Sqlite(text, reader.Context.BaseDirectory, out problem),
        };
        if (resolved is null && reader.Context.IsUnchecked(reader.KeyPath("connection")))
        {
            // The string's shape depends on a secret not available offline: already listed as not checked.
            return text;
        }

        if (resolved is null)
        {
            reader.Error("connection", problem!);
        }

        return usable ? resolved : null;
    }
}
