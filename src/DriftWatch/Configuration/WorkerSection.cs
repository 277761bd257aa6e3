using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary><c>worker:</c> the process of <c>driftwatch run</c>.</summary>
internal static class WorkerSection
{
    /// <summary>A stop longer than this outlasts every supervisor's patience; it would end in SIGKILL anyway.</summary>
    public static readonly TimeSpan MaxStopGrace = TimeSpan.FromMinutes(10);

    public static WorkerConfig Read(MappingReader? reader)
    {
        var defaults = new WorkerConfig();
        if (reader is null)
        {
            return defaults;
        }

        var grace = reader.Duration("stop_grace", TimeSpan.FromSeconds(1), MaxStopGrace) ?? defaults.StopGrace;
        reader.Done();
        return new WorkerConfig { StopGrace = grace };
    }
}
