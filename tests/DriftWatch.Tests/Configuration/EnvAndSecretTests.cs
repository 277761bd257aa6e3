using DriftWatch.Configuration;
using Npgsql;

namespace DriftWatch.Tests.Configuration;

public sealed class EnvAndSecretTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private static string PostgresSource(string connection, string extra = "") => $"""
        sources:
          - name: shop
            kind: postgres
            connection: {connection}
        {extra}
        """;

    [Fact]
    public void Parse_EnvWithDefault_UsesVariableWhenSetElseDefault()
    {
        var yaml = PostgresSource("Host=${PGH:-fallback.example};Database=${PGDB:-grocer}");
        var set = ConfigText.Parse(yaml, new Dictionary<string, string> { ["PGH"] = "db.example" });
        Assert.True(set.Ok, string.Join("\n", ConfigText.Lines(set)));
        var builder = new NpgsqlConnectionStringBuilder(set.Config!.Sources[0].ConnectionString);
        Assert.Equal("db.example", builder.Host);
        Assert.Equal("grocer", builder.Database);

        // Shell semantics of ":-" (POSIX sh parameter expansion, from memory): empty counts as unset.
        var empty = ConfigText.Parse(yaml, new Dictionary<string, string> { ["PGH"] = string.Empty });
        Assert.Equal("fallback.example", new NpgsqlConnectionStringBuilder(empty.Config!.Sources[0].ConnectionString).Host);
    }

    [Fact]
    public void Parse_MissingVariable_NamesTheVariable()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(PostgresSource("Host=${PG_HOST};Password=${PG_PASSWORD}"), new Dictionary<string, string> { ["PG_HOST"] = "h" }));
        Assert.Equal(["test.yaml:4:17: sources[0].connection: environment variable PG_PASSWORD is not set and has no default (write ${PG_PASSWORD:-default} to give one)"], errors);
    }

    [Fact]
    public void Parse_DoubleDollar_WritesLiteralReference()
    {
        var result = ConfigText.Parse(ConfigText.SqliteSource + """

            pairs:
              - name: a
                source: shop
                query: SELECT u, v FROM t WHERE note <> '$${x}'
                x: u
                y: v
            """);
        Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
        Assert.Equal("SELECT u, v FROM t WHERE note <> '${x}'", result.Config!.Pairs[0].Query);
    }

    [Fact]
    public void Parse_EnvInNonSecretValue_IsExpandedAndChecked()
    {
        var yaml = ConfigText.SqliteSource + "\ndashboard:\n  port: ${DASH_PORT:-8088}\n";
        Assert.Equal(8088, ConfigText.Parse(yaml).Config!.Dashboard.Port);
        var bad = ConfigText.Lines(ConfigText.Parse(yaml, new Dictionary<string, string> { ["DASH_PORT"] = "eighty" }));
        Assert.Equal(["test.yaml:6:9: dashboard.port: must be a whole number, was 'eighty'"], bad);
    }

    [Fact]
    public void Parse_PasswordFile_SetsPostgresPassword()
    {
        _dir.Write("pw", "file-Secret-31\r\n");
        var result = ConfigText.Parse(PostgresSource("Host=db;Username=reader", "    password_file: pw"), baseDirectory: _dir.Path);
        Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));

        // Npgsql's builder is the oracle for what the connection will use; the line break is not part of it.
        var builder = new NpgsqlConnectionStringBuilder(result.Config!.Sources[0].ConnectionString);
        Assert.Equal("file-Secret-31", builder.Password);
        Assert.Equal("reader", builder.Username);
    }

    [Fact]
    public void Parse_SmtpPasswordFile_IsRead()
    {
        _dir.Write("smtp.pw", "mail-Secret-5\n");
        var result = ConfigText.Parse(ConfigText.SqliteSource + """

            alerting:
              smtp:
                host: localhost
                user: dw
                password_file: smtp.pw
                from: dw@grocer.example
            """, baseDirectory: _dir.Path);
        Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
        Assert.Equal("mail-Secret-5", result.Config!.Alerting.Smtp!.Password);
    }

    [Fact]
    public void Parse_MissingPasswordFile_NamesThePath()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(PostgresSource("Host=db", "    password_file: nope.txt"), baseDirectory: _dir.Path));
        Assert.Equal([$"test.yaml:5:20: sources[0].password_file: cannot read '{Path.Combine(_dir.Path, "nope.txt")}': no such file"], errors);
    }

    [Fact]
    public void Parse_PasswordFileForSqlite_IsAnError()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(ConfigText.SqliteSource + "\n    password_file: pw\n"));
        Assert.Equal(["test.yaml:5:20: sources[0].password_file: applies to postgres and mysql connections only"], errors);
    }

    /// <summary>Every way a secret can be wrong; none of the messages may quote it.</summary>
    [Fact]
    public void Parse_BrokenSecrets_NeverAppearInMessages()
    {
        const string ConnSecret = "Conn-Secret-Alpha";
        const string FileSecret = "File-Secret-Beta";
        const string SmtpSecret = "Smtp-Secret-Gamma";
        const string TokenSecret = "tok-Delta";
        _dir.Write("pw", FileSecret);
        var env = new Dictionary<string, string>
        {
            ["PG_MALFORMED"] = $"Host=db;Password='{ConnSecret}",
            ["PG_UNKNOWN_KEY"] = $"Host=db;Passwort={ConnSecret}",
            ["PG_BAD_PORT"] = $"Host=db;Port={ConnSecret}",
            ["PG_NO_HOST"] = $"Database=grocer;Password={ConnSecret}",
            ["PG_BOTH"] = $"Host=db;Password={ConnSecret}",
            ["SMTP_PASSWORD"] = SmtpSecret,
            ["TOKEN"] = TokenSecret,
        };
        var yaml = $$"""
            sources:
              - name: malformed
                kind: postgres
                connection: ${PG_MALFORMED}
              - name: unknown-key
                kind: postgres
                connection: ${PG_UNKNOWN_KEY}
              - name: bad-port
                kind: postgres
                connection: ${PG_BAD_PORT}
              - name: no-host
                kind: postgres
                connection: ${PG_NO_HOST}
              - name: both
                kind: postgres
                connection: ${PG_BOTH}
                password_file: pw
              - name: literal
                kind: postgres
                connection: Host=db;Password={{ConnSecret}}${bad name}
            store:
              kind: postgres
              connection: "Server=db;Password={{ConnSecret}};Timeout=soon"
            alerting:
              smtp:
                host: mail
                password: ${SMTP_PASSWORD}
                password_file: pw
                from: dw@grocer.example
            dashboard:
              bind: 0.0.0.0
              access_token: ${TOKEN}
            """;
        var result = ConfigText.Parse(yaml, env, _dir.Path);
        var errors = ConfigText.Lines(result);

        // Each broken secret was reported (one line each) ...
        Assert.Equal(9, errors.Length);
        Assert.All(
            new[] { "sources[0].connection", "sources[1].connection", "sources[2].connection", "sources[3].connection", "sources[4].connection", "sources[5].connection", "store.connection", "alerting.smtp.password_file", "dashboard.access_token" },
            key => Assert.Contains(errors, e => e.Contains($": {key}: ", StringComparison.Ordinal)));

        // ... and no message, nor the result's text, quotes one.
        foreach (var secret in new[] { ConnSecret, FileSecret, SmtpSecret, TokenSecret })
        {
            Assert.All(errors, e => Assert.DoesNotContain(secret, e, StringComparison.Ordinal));
        }
    }

    [Fact]
    public void SourceConfig_ToString_HidesConnection()
    {
        var result = ConfigText.Parse(PostgresSource("Host=db;Password=Visible-Secret"));
        Assert.Equal("shop (Postgres)", result.Config!.Sources[0].ToString());
    }

    [Fact]
    public void EnvExpander_UnterminatedReference_IsAProblem()
    {
        Assert.Null(EnvExpander.Expand("a${B", _ => "x", secret: false, out var problem));
        Assert.Equal("a '${' has no closing '}' (write $${ for a literal ${)", problem);
    }
}
