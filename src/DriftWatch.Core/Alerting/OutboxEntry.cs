using DriftWatch.Core.Configuration;

namespace DriftWatch.Core.Alerting;

/// <summary>A stored outbox row. <paramref name="Mime"/> is null in listings that do not load it.</summary>
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
    byte[]? Mime)
{
    public bool IsSent => SentAt is not null;
}
