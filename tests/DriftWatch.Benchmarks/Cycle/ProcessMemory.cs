using System.Globalization;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>
/// Peak resident set size of this process from /proc/self/status (VmHWM, the figure
/// <see cref="System.Diagnostics.Process.PeakWorkingSet64"/> also reads). Writing 5 to /proc/self/clear_refs
/// resets the mark to the current RSS (Linux ≥ 4.0), so each cycle gets its own peak.
/// </summary>
internal static class ProcessMemory
{
    /// <summary>VmHWM in bytes; 0 when /proc is not there (not Linux).</summary>
    public static long PeakResidentBytes() => ReadStatusKilobytes("VmHWM:") * 1024;

    public static long ResidentBytes() => ReadStatusKilobytes("VmRSS:") * 1024;

    /// <summary>True when the peak mark could be reset.</summary>
    public static bool TryResetPeak()
    {
        try
        {
            File.WriteAllText("/proc/self/clear_refs", "5");
            return true;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return false;
        }
    }

    private static long ReadStatusKilobytes(string key)
    {
        const string path = "/proc/self/status";
        if (!File.Exists(path))
        {
            return 0;
        }

        foreach (var line in File.ReadLines(path))
        {
            if (line.StartsWith(key, StringComparison.Ordinal))
            {
                // "VmHWM:	  123456 kB"
                var number = line[key.Length..].Trim().Split(' ', StringSplitOptions.RemoveEmptyEntries)[0];
                return long.Parse(number, CultureInfo.InvariantCulture);
            }
        }

        return 0;
    }
}
