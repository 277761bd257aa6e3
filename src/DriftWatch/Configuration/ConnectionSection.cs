namespace DriftWatch.Configuration;

/// <summary>The <c>connection</c> and <c>password_file</c> keys a source and the store share.</summary>
internal static class ConnectionSection
{
    /// <summary>The resolved connection string, or null (reported). <paramref name="sqliteDefault"/> applies when the key is absent.</summary>
    public static string? Read(MappingReader reader, bool postgres, string? sqliteDefault)
    {
        var passwordFile = reader.Text("password_file");
        var text = reader.Text("connection", secret: true);
        var usable = true;
        string? password = null;
        if (passwordFile is not null)
        {
            if (!postgres)
            {
                reader.Error("password_file", "applies to postgres connections only");
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

        if (text is null)
        {
            if (postgres || sqliteDefault is null)
            {
                reader.Missing("connection", postgres
                    ? "is required: an Npgsql connection string such as Host=db;Database=shop;Username=reader"
                    : "is required: a SQLite file path or Data Source=path");
                return null;
            }

            text = sqliteDefault;
        }

        string? problem;
        var resolved = postgres
            ? ConnectionStrings.Postgres(text, password, out problem)
            : ConnectionStrings.Sqlite(text, reader.Context.BaseDirectory, out problem);
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
