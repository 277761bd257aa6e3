using DriftWatch.Core.Configuration;

namespace DriftWatch.Spool;

/// <summary>The spool's folder (resolved) and bounds, from <c>worker.spool</c>.</summary>
internal sealed record SpoolOptions(string Directory, int MaxRuns, long MaxBytes)
{
    public static SpoolOptions From(DriftWatchConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        var spool = config.Worker.Spool;
        return new SpoolOptions(Path.GetFullPath(spool.FolderFor(config.FilePath)), spool.MaxRuns, spool.MaxBytes);
    }
}
