using System.Globalization;
using DriftWatch.Core.History;

namespace DriftWatch.Spool;

/// <summary>The run recorded for a check whose marker outlived its process.</summary>
internal static class InterruptedRuns
{
    public static NewRun From(CheckMarker marker, DateTimeOffset noticedAt)
    {
        ArgumentNullException.ThrowIfNull(marker);
        var started = marker.StartedAt.ToString("yyyy-MM-dd HH:mm:ss'Z'", CultureInfo.InvariantCulture);
        var noticed = noticedAt.ToString("yyyy-MM-dd HH:mm:ss'Z'", CultureInfo.InvariantCulture);
        // When the process died is not known: the run ends where it started rather than claim a duration.
        return new NewRun(
            marker.Pair,
            marker.StartedAt,
            marker.StartedAt,
            RunStatus.Interrupted,
            $"the check started at {started} was cut off before it finished (the worker stopped or crashed); recorded at the next start, {noticed}",
            null,
            [],
            null,
            null)
        {
            RunKey = marker.RunKey,
        };
    }
}
