namespace DriftWatch.Alerting.Outbox;

/// <summary>What one pass over the outbox did.</summary>
internal sealed record DispatchResult(int Sent, int Failed, int Deferred)
{
    public static DispatchResult None { get; } = new(0, 0, 0);
}
