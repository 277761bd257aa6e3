namespace DriftWatch.Core.Configuration;

/// <summary>How <c>driftwatch run</c> behaves as a process.</summary>
public sealed record WorkerConfig
{
    /// <summary>Long enough for a typical check to finish; shorter than a supervisor's usual 45 s stop timeout.</summary>
    public static readonly TimeSpan DefaultStopGrace = TimeSpan.FromSeconds(30);

    /// <summary>Often enough that a confirmed alert leaves within a minute; rarely enough to cost nothing.</summary>
    public static readonly TimeSpan DefaultAlertEvery = TimeSpan.FromSeconds(30);

    /// <summary>Often enough that a dead worker is noticed within seconds; a beat is one small write to the store.</summary>
    public static readonly TimeSpan DefaultHeartbeat = TimeSpan.FromSeconds(5);

    /// <summary>Four missed heartbeats: a worker that is merely slow (a long GC pause, a busy store) is not taken over.</summary>
    public static readonly TimeSpan DefaultTakeoverAfter = TimeSpan.FromSeconds(20);

    /// <summary>On SIGTERM or Ctrl+C, how long running checks may go on before they are cancelled.</summary>
    public TimeSpan StopGrace { get; init; } = DefaultStopGrace;

    /// <summary>
    /// Names this worker among those sharing the store, the same across its restarts; it owns the outbox rows the
    /// worker claims, so a restarted worker takes its own claims back at once. Null: the host name.
    /// </summary>
    public string? Id { get; init; }

    /// <summary>How often the worker evaluates alerts over the new runs (and then wakes the outbox).</summary>
    public TimeSpan AlertEvery { get; init; } = DefaultAlertEvery;

    /// <summary>
    /// True: the schedule lives in the store (PostgreSQL only) and every worker on the store shares it, so each slot of
    /// each pair runs on exactly one of them. False: this worker keeps its own schedule in memory (one worker per store).
    /// </summary>
    public bool SharedSchedule { get; init; }

    /// <summary>How often the worker writes its row in worker_instances (and checks in with the shared schedule).</summary>
    public TimeSpan Heartbeat { get; init; } = DefaultHeartbeat;

    /// <summary>A worker silent this long is taken for dead: its checks in flight run again elsewhere, its leases run out.</summary>
    public TimeSpan TakeoverAfter { get; init; } = DefaultTakeoverAfter;

    /// <summary>The spool of runs the store could not take (worker.spool).</summary>
    public WorkerSpoolConfig Spool { get; init; } = new();
}
