using System.Net.Sockets;
using System.Security.Cryptography.X509Certificates;
using DriftWatch.Configuration;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using MailKit;
using MailKit.Net.Smtp;
using MailKit.Security;
using MimeKit;

namespace DriftWatch.Alerting.Channels.Smtp;

/// <summary>Sends through the configured SMTP server with MailKit: one connection per message, closed after it.</summary>
internal sealed class SmtpAlertChannel(SmtpConfig? smtp, TimeSpan? timeout = null) : IAlertChannel
{
    public static readonly TimeSpan DefaultTimeout = TimeSpan.FromSeconds(60);

    // Read once: the loader has checked the file at start-up.
    private readonly X509Certificate2Collection? _authorities = smtp?.CaFile is { } caFile ? TrustedAuthorities.Read(caFile, out _) : null;

    public ChannelKind Kind => ChannelKind.Smtp;

    public ChannelBody Body => ChannelBody.Mail;

    public async Task SendAsync(OutboxEntry entry, MailingListConfig list, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(entry);
        ArgumentNullException.ThrowIfNull(list);
        var bytes = entry.Mime ?? throw new InvalidOperationException($"Outbox entry {entry.Id} was claimed without its message.");
        using var stream = new MemoryStream(bytes, writable: false);
        using var message = await MimeMessage.LoadAsync(stream, cancellationToken);
        if (smtp is null)
        {
            throw new ChannelUnavailableException($"Mailing list '{list.Name}' sends by SMTP but alerting.smtp is not configured.");
        }

        var certificates = new ServerCertificateCheck(smtp.Host, _authorities);
        using var client = new SmtpClient
        {
            Timeout = (int)(timeout ?? DefaultTimeout).TotalMilliseconds,
            ServerCertificateValidationCallback = certificates.Validate,
            // A private authority (ca_file) seldom publishes revocation lists; with the system's roots MailKit checks them.
            CheckCertificateRevocation = _authorities is null,
        };
        try
        {
            await client.ConnectAsync(smtp.Host, smtp.Port, Security(smtp.Security), cancellationToken);
            if (!string.IsNullOrEmpty(smtp.User))
            {
                await client.AuthenticateAsync(smtp.User, smtp.Password ?? "", cancellationToken);
            }
        }
        catch (SslHandshakeException ex)
        {
            throw new ChannelUnavailableException($"SMTP server {smtp} unavailable: TLS handshake failed: {certificates.Problem ?? FirstLine(ex.Message)}", ex);
        }
        catch (NotSupportedException ex) when (smtp.Security == SmtpSecurity.StartTls)
        {
            // MailKit refuses to go on in clear text when STARTTLS is required but not offered.
            throw new ChannelUnavailableException($"SMTP server {smtp} unavailable: it does not offer STARTTLS, which security: starttls requires", ex);
        }
        catch (Exception ex) when (ex is SocketException or IOException or SmtpProtocolException or SmtpCommandException
                                       or MailKit.Security.AuthenticationException or System.Security.Authentication.AuthenticationException or TimeoutException)
        {
            throw new ChannelUnavailableException($"SMTP server {smtp} unavailable: {FirstLine(ex.Message)}", ex);
        }

        try
        {
            await client.SendAsync(message, cancellationToken);
        }
        catch (SmtpCommandException ex) when (ex.ErrorCode is SmtpErrorCode.RecipientNotAccepted or SmtpErrorCode.SenderNotAccepted or SmtpErrorCode.MessageNotAccepted)
        {
            // Refused for this message (an address, its size): the server works, other messages may pass.
            throw new InvalidOperationException($"SMTP server {smtp} refused message {entry.MessageId}: {ex.Message}", ex);
        }
        catch (Exception ex) when (ex is SocketException or IOException or SmtpProtocolException or SmtpCommandException or TimeoutException or ServiceNotConnectedException)
        {
            throw new ChannelUnavailableException($"SMTP server {smtp} failed while sending: {ex.Message}", ex);
        }

        try
        {
            await client.DisconnectAsync(true, cancellationToken);
        }
        catch (Exception ex) when (ex is SocketException or IOException or SmtpProtocolException)
        {
            // The message was accepted; a failed QUIT does not un-send it.
        }
    }

    /// <summary>A failed attempt is logged as one line; the full exception waits for debug level.</summary>
    private static string FirstLine(string message) =>
        message.Split('\n', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries) is [var first, ..] ? first : message;

    private static SecureSocketOptions Security(SmtpSecurity security) => security switch
    {
        SmtpSecurity.Tls => SecureSocketOptions.SslOnConnect,
        SmtpSecurity.None => SecureSocketOptions.None,
        _ => SecureSocketOptions.StartTls,
    };
}
