using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary><c>worker:</c> the process of <c>driftwatch run</c>.</summary>
internal static class WorkerSection
{
    /// <summary>A stop longer than this outlasts every supervisor's patience; it would end in SIGKILL anyway.</summary>
    public static readonly TimeSpan MaxStopGrace = TimeSpan.FromMinutes(10);

    /// <summary>Room for a host name (255) and a suffix; it is stored with every claimed outbox row.</summary>
    public const int MaxIdLength = 200;

    /// <summary>Cron schedules go down to a second; evaluating more often finds nothing new.</summary>
    public static readonly TimeSpan MinAlertEvery = TimeSpan.FromSeconds(1);

    /// <summary>Longer would hold a confirmed alert back for more than an hour.</summary>
    public static readonly TimeSpan MaxAlertEvery = TimeSpan.FromHours(1);

    /// <summary>A spool smaller than this cannot hold one run with its points.</summary>
    public const long MinSpoolBytes = 1024 * 1024;

    /// <summary>Cron slots are a second apart at the finest; beating more often only loads the store.</summary>
    public static readonly TimeSpan MinHeartbeat = TimeSpan.FromSeconds(1);

    public static readonly TimeSpan MaxHeartbeat = TimeSpan.FromMinutes(5);

    /// <summary>Room for scheduling delays: a takeover sooner than this would take over live workers.</summary>
    public const int MinBeatsBeforeTakeover = 2;

    /// <param name="store">The store section, read before: a shared schedule needs PostgreSQL.</param>
    public static WorkerConfig Read(ConfigContext context, MappingReader? reader, StoreConfig? store = null)
    {
        ArgumentNullException.ThrowIfNull(context);
        // The spool's folder is always resolved here, where relative paths have the configuration file's folder to start from.
        var defaults = new WorkerConfig { Spool = new WorkerSpoolConfig { Path = context.ResolvePath(WorkerSpoolConfig.DefaultFolderName) } };
        if (reader is null)
        {
            return defaults;
        }

        var grace = reader.Duration("stop_grace", TimeSpan.FromSeconds(1), MaxStopGrace) ?? defaults.StopGrace;
        var id = reader.Text("id");
        if (id is not null && (id.Length is 0 or > MaxIdLength || id.Any(char.IsControl) || id.Trim() != id))
        {
            reader.Error("id", $"must be 1 to {MaxIdLength} characters without control characters or surrounding spaces");
            id = null;
        }

        var alertEvery = reader.Duration("alert_every", MinAlertEvery, MaxAlertEvery) ?? defaults.AlertEvery;
        var shared = reader.Bool("shared_schedule") ?? false;
        if (shared && store is { Kind: not StoreKind.Postgres })
        {
            reader.Error("shared_schedule", "needs a PostgreSQL store (store.kind: postgres): the shared schedule lives in the store's database");
        }

        var heartbeat = reader.Duration("heartbeat", MinHeartbeat, MaxHeartbeat) ?? defaults.Heartbeat;
        var takeover = reader.Duration("takeover_after", MinHeartbeat * MinBeatsBeforeTakeover, TimeSpan.FromHours(1)) ?? defaults.TakeoverAfter;
        if (takeover < heartbeat * MinBeatsBeforeTakeover)
        {
            reader.Error("takeover_after", $"must be at least {MinBeatsBeforeTakeover} heartbeats ({DurationText(heartbeat * MinBeatsBeforeTakeover)}), was {DurationText(takeover)}");
            takeover = heartbeat * MinBeatsBeforeTakeover;
        }

        var spool = ReadSpool(context, reader.Mapping("spool", ConfigKeys.WorkerSpool));
        reader.Done();
        return new WorkerConfig
        {
            StopGrace = grace, Id = id, Spool = spool, AlertEvery = alertEvery, SharedSchedule = shared, Heartbeat = heartbeat, TakeoverAfter = takeover,
        };
    }

    private static string DurationText(TimeSpan value) => value.TotalSeconds.ToString("0.###", System.Globalization.CultureInfo.InvariantCulture) + "s";

    private static WorkerSpoolConfig ReadSpool(ConfigContext context, MappingReader? reader)
    {
        var defaults = new WorkerSpoolConfig { Path = context.ResolvePath(WorkerSpoolConfig.DefaultFolderName) };
        if (reader is null)
        {
            return defaults;
        }

        var path = reader.Text("path");
        if (path is not null && (path.Length == 0 || path.Any(char.IsControl)))
        {
            reader.Error("path", "must be a folder path without control characters");
            path = null;
        }

        var maxRuns = reader.Int("max_runs", 1, 10_000_000) ?? defaults.MaxRuns;
        var maxBytes = reader.Long("max_bytes", MinSpoolBytes, long.MaxValue) ?? defaults.MaxBytes;
        reader.Done();
        return new WorkerSpoolConfig { Path = path is null ? defaults.Path : context.ResolvePath(path), MaxRuns = maxRuns, MaxBytes = maxBytes };
    }
}
