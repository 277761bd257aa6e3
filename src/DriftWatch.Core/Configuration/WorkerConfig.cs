namespace DriftWatch.Core.Configuration;

/// <summary>How <c>driftwatch run</c> behaves as a process.</summary>
public sealed record WorkerConfig
{
    /// <summary>Long enough for a typical check to finish; shorter than a supervisor's usual 45 s stop timeout.</summary>
    public static readonly TimeSpan DefaultStopGrace = TimeSpan.FromSeconds(30);

    /// <summary>On SIGTERM or Ctrl+C, how long running checks may go on before they are cancelled.</summary>
    public TimeSpan StopGrace { get; init; } = DefaultStopGrace;

    /// <summary>
    /// Names this worker among those sharing the store, the same across its restarts; it owns the outbox rows the
    /// worker claims, so a restarted worker takes its own claims back at once. Null: the host name.
    /// </summary>
    public string? Id { get; init; }

    /// <summary>The spool of runs the store could not take (worker.spool).</summary>
    public WorkerSpoolConfig Spool { get; init; } = new();
}
