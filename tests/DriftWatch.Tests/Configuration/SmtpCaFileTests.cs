namespace DriftWatch.Tests.Configuration;

/// <summary>
/// <c>alerting.smtp.ca_file</c> is read at start-up: a wrong path or a file without a certificate stops the start
/// with a message naming file, line, key and path, never at the first alert hours later.
/// </summary>
public sealed class SmtpCaFileTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    // Lines 1-9; ca_file is line 10 (column 5).
    private static string Yaml(string security, string caFile) => ConfigText.SqliteSource + $$"""

        alerting:
          smtp:
            host: mail.example.org
            port: 587
            security: {{security}}
            from: DriftWatch <dw@example.org>
            ca_file: {{caFile}}
        """;

    [Fact]
    public void Parse_MissingCaFile_NamesKeyAndPath()
    {
        var error = ConfigText.Single(ConfigText.Parse(Yaml("starttls", "missing-ca.pem"), baseDirectory: _dir.Path));
        Assert.Equal($"test.yaml:11:14: alerting.smtp.ca_file: file {Path.Combine(_dir.Path, "missing-ca.pem")} does not exist", error.ToString());
    }

    [Fact]
    public void Parse_CaFileWithoutCertificate_SaysWhatIsExpected()
    {
        _dir.Write("notes.pem", "not a certificate\n");
        var error = ConfigText.Single(ConfigText.Parse(Yaml("tls", "notes.pem"), baseDirectory: _dir.Path));
        Assert.Equal(
            $"test.yaml:11:14: alerting.smtp.ca_file: file {Path.Combine(_dir.Path, "notes.pem")} holds no PEM certificate (expected -----BEGIN CERTIFICATE-----)",
            error.ToString());
    }

    [Fact]
    public void Parse_CaFileWithSecurityNone_IsRefused()
    {
        _dir.Write("notes.pem", "not read\n");
        var error = ConfigText.Single(ConfigText.Parse(Yaml("none", "notes.pem"), baseDirectory: _dir.Path));
        Assert.Equal("test.yaml:11:14: alerting.smtp.ca_file: is given but security is none: without TLS no certificate is checked; use starttls or tls", error.ToString());
    }
}
