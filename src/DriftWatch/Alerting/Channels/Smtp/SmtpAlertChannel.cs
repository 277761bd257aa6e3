using System.Net.Sockets;
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

    public ChannelKind Kind => ChannelKind.Smtp;

    public async Task SendAsync(OutboxEntry entry, MimeMessage message, MailingListConfig list, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(message);
        if (smtp is null)
        {
            throw new ChannelUnavailableException($"Mailing list '{list.Name}' sends by SMTP but alerting.smtp is not configured.");
        }

        using var client = new SmtpClient { Timeout = (int)(timeout ?? DefaultTimeout).TotalMilliseconds };
        try
        {
            await client.ConnectAsync(smtp.Host, smtp.Port, Security(smtp.Security), cancellationToken);
            if (!string.IsNullOrEmpty(smtp.User))
            {
                await client.AuthenticateAsync(smtp.User, smtp.Password ?? "", cancellationToken);
            }
        }
        catch (Exception ex) when (ex is SocketException or IOException or SmtpProtocolException or SmtpCommandException
                                       or MailKit.Security.AuthenticationException or System.Security.Authentication.AuthenticationException or SslHandshakeException or TimeoutException)
        {
            throw new ChannelUnavailableException($"SMTP server {smtp} unavailable: {ex.Message}", ex);
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

    private static SecureSocketOptions Security(SmtpSecurity security) => security switch
    {
        SmtpSecurity.Tls => SecureSocketOptions.SslOnConnect,
        SmtpSecurity.None => SecureSocketOptions.None,
        _ => SecureSocketOptions.StartTls,
    };
}
