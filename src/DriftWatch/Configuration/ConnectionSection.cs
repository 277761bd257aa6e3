namespace DriftWatch.Configuration;

/// <summary>The <c>connection</c> and <c>password_file</c> keys a source and the store share.</summary>
internal static class ConnectionSection
{
    /// <summary>The resolved connection string, or null (reported). <paramref name="sqliteDefault"/> applies when the key is absent.</summary>
    public static string? Read(MappingReader reader, bool postgres, string? sqliteDefault)
    {
        var passwordFile = reader.Text("password_file");
        string? password = null;
        if (passwordFile is not null)
        {
            if (!postgres)
            {
                reader.Error("password_file", "applies to postgres connections only");
            }
            else
            {
                var path = reader.Context.ResolvePath(passwordFile);
                password = SecretFiles.Read(path, out var fileProblem);
                if (password is null)
                {
                    reader.Error("password_file", fileProblem!);
                    return null;
                }
            }
        }

        var text = reader.Text("connection", secret: true);
        if (text is null)
        {
            if (!reader.Has("connection"))
            {
                if (!postgres && sqliteDefault is not null)
                {
                    text = sqliteDefault;
                }
                else
                {
                    reader.Missing("connection", postgres
                        ? "is required: an Npgsql connection string such as Host=db;Database=shop;Username=reader"
                        : "is required: a SQLite file path or Data Source=path");
                    return null;
                }
            }
            else
            {
                return null;
            }
        }

        string? problem;
        var resolved = postgres
            ? ConnectionStrings.Postgres(text, password, out problem)
            : ConnectionStrings.Sqlite(text, reader.Context.BaseDirectory, out problem);
        if (resolved is null)
        {
            reader.Error("connection", problem!);
        }

        return resolved;
    }
}
