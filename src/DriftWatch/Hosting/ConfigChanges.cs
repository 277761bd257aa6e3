using System.Text.Json;
using System.Text.Json.Serialization;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Hosting;

/// <summary>
/// What a reload changes. Pairs and sources apply live; the store, the dashboard, logging, alerting (channels and
/// mailing lists are built once at start) and the worker section need a restart: those keep the values in force,
/// and each one that changed is named in <see cref="NeedsRestart"/>.
/// </summary>
internal sealed record ConfigChanges(
    IReadOnlyList<PairConfig> Added,
    IReadOnlyList<PairConfig> Removed,
    IReadOnlyList<PairConfig> Rescheduled,
    IReadOnlyList<PairConfig> Changed,
    IReadOnlyList<string> SourcesChanged,
    IReadOnlyList<string> NeedsRestart)
{
    // Records holding lists compare lists by reference; their JSON compares what they hold. Enums as text, so a
    // reordered enum cannot make two equal settings look different.
    private static readonly JsonSerializerOptions Compare = new()
    {
        Converters = { new JsonStringEnumConverter() },
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
    };

    public bool IsEmpty => Added.Count + Removed.Count + Rescheduled.Count + Changed.Count + SourcesChanged.Count + NeedsRestart.Count == 0;

    /// <summary>The configuration to put in force: <paramref name="next"/> with the restart-only sections of <paramref name="current"/>.</summary>
    public static DriftWatchConfig Effective(DriftWatchConfig current, DriftWatchConfig next)
    {
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(next);
        return next with
        {
            Store = current.Store,
            Dashboard = current.Dashboard,
            Logging = current.Logging,
            Alerting = current.Alerting,
            Worker = current.Worker,
        };
    }

    public static ConfigChanges Between(DriftWatchConfig current, DriftWatchConfig next)
    {
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(next);
        var before = current.Pairs.ToDictionary(p => p.Name, StringComparer.Ordinal);
        var after = next.Pairs.ToDictionary(p => p.Name, StringComparer.Ordinal);
        var added = next.Pairs.Where(p => !before.ContainsKey(p.Name)).ToList();
        var removed = current.Pairs.Where(p => !after.ContainsKey(p.Name)).ToList();
        var rescheduled = new List<PairConfig>();
        var changed = new List<PairConfig>();
        foreach (var pair in next.Pairs.Where(p => before.ContainsKey(p.Name)))
        {
            var old = before[pair.Name];
            if (!string.Equals(old.Schedule, pair.Schedule, StringComparison.Ordinal))
            {
                rescheduled.Add(pair);
            }
            // Where a pair is written in the file is not a setting: moving it is no change.
            else if (!Same(old with { Location = null }, pair with { Location = null }))
            {
                changed.Add(pair);
            }
        }

        var oldSources = current.Sources.ToDictionary(s => s.Name, StringComparer.Ordinal);
        var sources = next.Sources.Where(s => !oldSources.TryGetValue(s.Name, out var old) || !Same(old, s)).Select(s => s.Name)
            .Concat(current.Sources.Where(s => next.FindSource(s.Name) is null).Select(s => s.Name))
            .ToList();

        var restart = new List<string>();
        AddIfChanged(restart, "store", current.Store, next.Store);
        AddIfChanged(restart, "dashboard", current.Dashboard, next.Dashboard);
        AddIfChanged(restart, "logging", current.Logging, next.Logging);
        AddIfChanged(restart, "alerting", current.Alerting, next.Alerting);
        AddIfChanged(restart, "worker", current.Worker, next.Worker);
        return new ConfigChanges(added, removed, rescheduled, changed, sources, restart);
    }

    private static void AddIfChanged<T>(List<string> restart, string section, T current, T next)
    {
        if (!Same(current, next))
        {
            restart.Add(section);
        }
    }

    private static bool Same<T>(T a, T b) =>
        string.Equals(JsonSerializer.Serialize(a, Compare), JsonSerializer.Serialize(b, Compare), StringComparison.Ordinal);
}
