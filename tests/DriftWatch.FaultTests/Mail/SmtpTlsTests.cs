using DriftWatch.Alerting.Channels;
using DriftWatch.Alerting.Channels.Smtp;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.FaultTests.Infrastructure;
using MimeKit;

namespace DriftWatch.FaultTests.Mail;

/// <summary>
/// The SMTP channel over TLS against a real server (the SmtpServer package on loopback) whose certificate a
/// certificate authority made in the test issued: STARTTLS as on the submission port (587, RFC 6409 / RFC 3207)
/// and TLS from the first byte as on port 465 (RFC 8314). The authority is trusted only through ca_file.
/// </summary>
public sealed class SmtpTlsTests : IDisposable
{
    private readonly TestAuthority _authority = new("DriftWatch fault-test authority");
    private readonly TestAuthority _stranger = new("Some other authority");
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-tls-" + Guid.NewGuid().ToString("N"));

    public SmtpTlsTests() => Directory.CreateDirectory(_folder);

    [Fact]
    public async Task StartTls_ServerCertificateFromTrustedCaFile_Delivers()
    {
        using var certificate = _authority.IssueServerCertificate();
        await using var server = await LoopbackSmtpServer.StartAsync(certificate);

        await SendAsync(Config(server.Port, SmtpSecurity.StartTls, _authority.WritePem(Path.Combine(_folder, "ca.pem"))), "dw-starttls@driftwatch.local");

        Assert.Equal(["dw-starttls@driftwatch.local"], server.ReceivedIds);
    }

    [Fact]
    public async Task ImplicitTls_ServerCertificateFromTrustedCaFile_Delivers()
    {
        using var certificate = _authority.IssueServerCertificate();
        await using var server = await LoopbackSmtpServer.StartAsync(certificate, implicitTls: true);

        await SendAsync(Config(server.Port, SmtpSecurity.Tls, _authority.WritePem(Path.Combine(_folder, "ca.pem"))), "dw-tls@driftwatch.local");

        Assert.Equal(["dw-tls@driftwatch.local"], server.ReceivedIds);
    }

    [Fact]
    public async Task StartTls_PrivateCaNotTrusted_FailsInOneLineAndSendsNothing()
    {
        using var certificate = _authority.IssueServerCertificate();
        await using var server = await LoopbackSmtpServer.StartAsync(certificate);

        // No ca_file: the system's roots, which do not hold the test authority.
        var error = await Assert.ThrowsAsync<ChannelUnavailableException>(() => SendAsync(Config(server.Port, SmtpSecurity.StartTls, caFile: null), "dw-untrusted@driftwatch.local"));

        Assert.DoesNotContain('\n', error.Message);
        Assert.StartsWith($"SMTP server 127.0.0.1:{server.Port} (StartTls) unavailable: TLS handshake failed: the server's certificate (issuer CN=DriftWatch fault-test authority) is not trusted by the system's certificate authorities", error.Message, StringComparison.Ordinal);
        Assert.Empty(server.ReceivedIds);
    }

    [Fact]
    public async Task ImplicitTls_CaFileOfAnotherAuthority_FailsInOneLineAndSendsNothing()
    {
        using var certificate = _authority.IssueServerCertificate();
        await using var server = await LoopbackSmtpServer.StartAsync(certificate, implicitTls: true);

        var error = await Assert.ThrowsAsync<ChannelUnavailableException>(() =>
            SendAsync(Config(server.Port, SmtpSecurity.Tls, _stranger.WritePem(Path.Combine(_folder, "other.pem"))), "dw-other@driftwatch.local"));

        Assert.DoesNotContain('\n', error.Message);
        Assert.StartsWith($"SMTP server 127.0.0.1:{server.Port} (Tls) unavailable: TLS handshake failed: the server's certificate (issuer CN=DriftWatch fault-test authority) is not trusted by the authorities of ca_file (", error.Message, StringComparison.Ordinal);
        Assert.Empty(server.ReceivedIds);
    }

    [Fact]
    public async Task StartTls_ServerWithoutStartTls_FailsClearlyInsteadOfSendingInClearText()
    {
        // No certificate: the server does not offer STARTTLS at all.
        await using var server = await LoopbackSmtpServer.StartAsync();

        var error = await Assert.ThrowsAsync<ChannelUnavailableException>(() => SendAsync(Config(server.Port, SmtpSecurity.StartTls, caFile: null), "dw-plain@driftwatch.local"));

        Assert.Equal($"SMTP server 127.0.0.1:{server.Port} (StartTls) unavailable: it does not offer STARTTLS, which security: starttls requires", error.Message);
        Assert.Empty(server.ReceivedIds);
    }

    public void Dispose()
    {
        _authority.Dispose();
        _stranger.Dispose();
        Directory.Delete(_folder, recursive: true);
    }

    private static SmtpConfig Config(int port, SmtpSecurity security, string? caFile) => new()
    {
        Host = "127.0.0.1",
        Port = port,
        Security = security,
        CaFile = caFile,
        From = "DriftWatch <driftwatch@depot.example>",
    };

    private static async Task SendAsync(SmtpConfig smtp, string messageId)
    {
        using var message = new MimeMessage();
        message.From.Add(MailboxAddress.Parse(smtp.From));
        message.To.Add(MailboxAddress.Parse("fleet@depot.example"));
        message.Subject = "TLS delivery";
        message.MessageId = messageId;
        message.Body = new TextPart("plain") { Text = "A message over TLS." };
        using var bytes = new MemoryStream();
        await message.WriteToAsync(bytes);
        var entry = new OutboxEntry(1, messageId, "fleet", ChannelKind.Smtp, DateTimeOffset.UnixEpoch, DateTimeOffset.UnixEpoch, 0, null, null, message.Subject, ["fleet@depot.example"], bytes.ToArray());
        var list = new MailingListConfig { Name = "fleet", Recipients = ["fleet@depot.example"] };
        await new SmtpAlertChannel(smtp, TimeSpan.FromSeconds(30)).SendAsync(entry, list, CancellationToken.None);
    }
}
