using Microsoft.Extensions.Logging;

namespace DriftWatch.Spool;

/// <summary>
/// One file per running check under <c>started/</c> of the spool folder, written (fsync'd) when the check starts and
/// deleted once its run is in the store or the spool. The local disk, not the store: the store may be the very
/// thing that is down when the worker dies. A marker left at the next start is a check that was cut off.
/// </summary>
internal sealed class CheckMarkers(SpoolOptions options, ILogger<CheckMarkers> logger)
{
    private const string Extension = ".json";

    public string Directory => Path.Combine(options.Directory, "started");

    /// <summary>Leaves the marker; a disk that refuses it is logged, and the check goes on without one.</summary>
    public void Leave(CheckMarker marker)
    {
        ArgumentNullException.ThrowIfNull(marker);
        try
        {
            System.IO.Directory.CreateDirectory(Directory);
            DurableFile.Write(FileOf(marker.RunKey), SpoolFileFormat.Encode(marker));
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            logger.LogWarning("Could not leave the start marker of {Pair} in {Folder} (if the worker dies during this check, it is not recorded as interrupted): {Error}", marker.Pair, Directory, ex.Message);
        }
    }

    public void Clear(string runKey)
    {
        ArgumentNullException.ThrowIfNull(runKey);
        try
        {
            File.Delete(FileOf(runKey));
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            // Left behind, it becomes an interrupted run at the next start, which the store then refuses as a
            // second run with the same key: harmless.
            logger.LogWarning("Could not delete the start marker {RunKey}: {Error}", runKey, ex.Message);
        }
    }

    /// <summary>Markers left by a previous process (call at start, before any check runs); unreadable ones are reported and removed.</summary>
    public IReadOnlyList<CheckMarker> Left()
    {
        if (!System.IO.Directory.Exists(Directory))
        {
            return [];
        }

        var markers = new List<CheckMarker>();
        foreach (var file in System.IO.Directory.EnumerateFiles(Directory).Order(StringComparer.Ordinal))
        {
            try
            {
                markers.Add(SpoolFileFormat.DecodeMarker(File.ReadAllBytes(file)));
            }
            catch (Exception ex) when (ex is FormatException or IOException or UnauthorizedAccessException)
            {
                // A marker cut off while it was written: its check had only just begun and wrote nothing.
                logger.LogWarning("Start marker {File} cannot be read and is removed (a check cut off as it started): {Reason}", file, ex.Message);
                TryDelete(file);
            }
        }

        return [.. markers.OrderBy(m => m.StartedAt)];
    }

    public void Remove(CheckMarker marker)
    {
        ArgumentNullException.ThrowIfNull(marker);
        Clear(marker.RunKey);
        TryDelete(FileOf(marker.RunKey) + DurableFile.TempSuffix);
    }

    private string FileOf(string runKey) => Path.Combine(Directory, runKey + Extension);

    private static void TryDelete(string file)
    {
        try
        {
            File.Delete(file);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            // Best effort: the next start reports it again.
            _ = ex;
        }
    }
}
