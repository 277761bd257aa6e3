using DriftWatch.Core.Configuration;

namespace DriftWatch.Core.Alerting;

/// <summary>
/// A stored outbox row. <paramref name="Mime"/> (the stored body: an RFC 5322 message, or for the webhook channel the
/// JSON document) is null in listings that do not load it. <paramref name="FailedAt"/> is set when the message was
/// refused for good (a receiver rejected this message): it is kept for audit and never tried again.
/// </summary>
public sealed record OutboxEntry(
    long Id,
    string MessageId,
    string MailingList,
    ChannelKind Channel,
    DateTimeOffset CreatedAt,
    DateTimeOffset NextAttemptAt,
    int Attempts,
    string? LastError,
    DateTimeOffset? SentAt,
    string Subject,
    IReadOnlyList<string> Recipients,
    byte[]? Mime,
    DateTimeOffset? FailedAt = null)
{
    public bool IsSent => SentAt is not null;

    public bool IsFailed => FailedAt is not null;
}
