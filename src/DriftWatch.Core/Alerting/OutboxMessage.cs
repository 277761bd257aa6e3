using DriftWatch.Core.Configuration;

namespace DriftWatch.Core.Alerting;

/// <summary>
/// A composed message waiting to be written to the outbox. <paramref name="Mime"/> is the whole RFC 5322
/// message (smtp, file) or the JSON document posted (webhook); the dispatcher sends exactly these bytes, so a retry
/// is the same message (same Message-Id).
/// </summary>
public sealed record OutboxMessage(
    string MessageId,
    string MailingList,
    ChannelKind Channel,
    DateTimeOffset CreatedAt,
    string Subject,
    IReadOnlyList<string> Recipients,
    byte[] Mime);
