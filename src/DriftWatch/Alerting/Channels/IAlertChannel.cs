using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Alerting.Channels;

/// <summary>
/// Delivers one stored message. Throws <see cref="ChannelUnavailableException"/> when the channel itself is
/// down (server unreachable, login refused, folder not writable): the dispatcher then leaves that list's
/// other messages for later. <see cref="MessageRefusedException"/> says the receiver refused this message for good
/// (it is recorded as failed and not tried again). Any other exception is about this message alone and is retried.
/// </summary>
internal interface IAlertChannel
{
    ChannelKind Kind { get; }

    /// <summary>
    /// What the stored bytes are: channels that send the same kind of body (smtp and file both take the RFC 5322
    /// message) can take over each other's queued messages when a mailing list changes its channel.
    /// </summary>
    ChannelBody Body { get; }

    /// <param name="entry">The outbox row, with its bytes (<see cref="OutboxEntry.Mime"/>).</param>
    Task SendAsync(OutboxEntry entry, MailingListConfig list, CancellationToken cancellationToken);
}

/// <summary>The form of an outbox row's stored bytes.</summary>
internal enum ChannelBody
{
    /// <summary>An RFC 5322 message (smtp, file).</summary>
    Mail,

    /// <summary>The JSON document a webhook posts.</summary>
    Json,
}

/// <summary>The channel cannot deliver anything right now; a later attempt may succeed.</summary>
internal sealed class ChannelUnavailableException : Exception
{
    /// <summary>How long the receiver asked to be left alone (an HTTP <c>Retry-After</c>), when it said so.</summary>
    public TimeSpan? RetryAfter { get; init; }

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

/// <summary>
/// The receiver refused this one message in a way a retry cannot change (a webhook's HTTP 4xx other than 408 and
/// 429): the dispatcher records it as failed, keeps it for audit and does not try it again.
/// </summary>
internal sealed class MessageRefusedException : Exception
{
    public MessageRefusedException(string message, Exception? innerException = null)
        : base(message, innerException)
    {
    }

    public MessageRefusedException()
    {
    }

    public MessageRefusedException(string message)
        : base(message)
    {
    }
}
