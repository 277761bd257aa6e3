using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using MimeKit;

namespace DriftWatch.Alerting.Channels;

/// <summary>
/// Delivers one stored message. Throws <see cref="ChannelUnavailableException"/> when the channel itself is
/// down (server unreachable, login refused, folder not writable): the dispatcher then leaves that list's
/// other messages for later. Any other exception is about this message alone.
/// </summary>
internal interface IAlertChannel
{
    ChannelKind Kind { get; }

    /// <param name="entry">The outbox row, with its bytes.</param>
    /// <param name="message">The same bytes, parsed.</param>
    Task SendAsync(OutboxEntry entry, MimeMessage message, MailingListConfig list, CancellationToken cancellationToken);
}

/// <summary>The channel cannot deliver anything right now; a later attempt may succeed.</summary>
internal sealed class ChannelUnavailableException : Exception
{
    public ChannelUnavailableException(string message, Exception? innerException = null)
        : base(message, innerException)
    {
    }

    public ChannelUnavailableException()
    {
    }

    public ChannelUnavailableException(string message)
        : base(message)
    {
    }
}
