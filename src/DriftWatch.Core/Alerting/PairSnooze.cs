namespace DriftWatch.Core.Alerting;

/// <summary>A pair whose notifications are held back until <paramref name="Until"/>; states are still tracked.</summary>
public sealed record PairSnooze(string Pair, DateTimeOffset Until, DateTimeOffset CreatedAt, string? Reason);
