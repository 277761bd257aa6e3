namespace DriftWatch.Alerting.Outbox;

/// <summary>How the outbox is worked off. Defaults are named constants (and written in docs/alerting.md).</summary>
internal sealed record OutboxOptions
{
    public static readonly TimeSpan DefaultPollInterval = TimeSpan.FromSeconds(15);
    public static readonly TimeSpan DefaultLease = TimeSpan.FromMinutes(1);
    public static readonly TimeSpan DefaultRetryBase = TimeSpan.FromSeconds(30);
    public static readonly TimeSpan DefaultRetryMax = TimeSpan.FromHours(1);
    public static readonly TimeSpan DefaultSentRetention = TimeSpan.FromDays(30);
    public static readonly TimeSpan DefaultClearedRetention = TimeSpan.FromDays(180);
    public const int DefaultBatchSize = 50;
    public const double DefaultJitter = 0.5;

    /// <summary>How often the dispatcher looks for due messages (it is also woken after every alerting cycle).</summary>
    public TimeSpan PollInterval { get; init; } = DefaultPollInterval;

    /// <summary>
    /// A claimed message is not taken again before this has passed (another dispatcher may be sending it). The
    /// sender renews it every third of it while the batch is being sent, so a slow server never lets a lease run out
    /// under a message still in hand, and a dispatcher that died frees its messages within one lease.
    /// </summary>
    public TimeSpan Lease { get; init; } = DefaultLease;

    /// <summary>How often the leases of a batch in hand are renewed: a third of the lease, two chances before it ends.</summary>
    public TimeSpan RenewEvery => Lease / 3;

    /// <summary>Owner of the claims this dispatcher makes (<see cref="Outbox.ClaimOwner"/>); a worker takes its own back at start.</summary>
    public string ClaimOwner { get; init; } = Outbox.ClaimOwner.OfOneShot(new Core.Configuration.WorkerConfig());

    /// <summary>Delay before the first retry; it doubles with each failed attempt …</summary>
    public TimeSpan RetryBase { get; init; } = DefaultRetryBase;

    /// <summary>… up to this. A message is never given up: an outage loses nothing.</summary>
    public TimeSpan RetryMax { get; init; } = DefaultRetryMax;

    /// <summary>Share of each delay that is random (0 none, 1 "full jitter"), so retries from many instances spread out.</summary>
    public double Jitter { get; init; } = DefaultJitter;

    public int BatchSize { get; init; } = DefaultBatchSize;

    /// <summary>Sent messages are kept this long for audit, then pruned.</summary>
    public TimeSpan SentRetention { get; init; } = DefaultSentRetention;

    /// <summary>Cleared alerts are kept this long, then pruned.</summary>
    public TimeSpan ClearedRetention { get; init; } = DefaultClearedRetention;
}
