using DriftWatch.Store;

namespace DriftWatch.Dashboard.Health;

/// <summary>
/// The workers on this store as /healthz shows them (snake_case): each one's heartbeat and last check, and whether the
/// live ones run different configurations (several workers are meant to share one file; a mismatch is shown, not fatal).
/// </summary>
internal sealed record WorkersHealth(int Alive, bool ConfigMismatch, IReadOnlyList<WorkerHealth> Instances)
{
    public static WorkersHealth Of(IReadOnlyList<WorkerInstance> instances, DateTimeOffset now, TimeSpan aliveWithin)
    {
        ArgumentNullException.ThrowIfNull(instances);
        var rows = instances.Select(i => WorkerHealth.Of(i, now - i.LastSeenAt <= aliveWithin)).ToList();
        var alive = rows.Where(r => r.Alive).ToList();
        var mismatch = alive.Select(r => r.ConfigSha256).Distinct(StringComparer.Ordinal).Count() > 1;
        return new WorkersHealth(alive.Count, mismatch, rows);
    }
}

internal sealed record WorkerHealth(
    string Id,
    string Host,
    int Pid,
    DateTimeOffset StartedAt,
    DateTimeOffset LastSeenAt,
    bool Alive,
    string ConfigSha256,
    bool SharedSchedule,
    string? LastPair,
    DateTimeOffset? LastCheckAt)
{
    public static WorkerHealth Of(WorkerInstance instance, bool alive)
    {
        ArgumentNullException.ThrowIfNull(instance);
        return new(instance.Id, instance.Host, instance.Pid, instance.StartedAt, instance.LastSeenAt, alive, instance.ConfigSha256, instance.SharedSchedule, instance.LastPair, instance.LastCheckAt);
    }
}
