using System.Globalization;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>
/// CPU time spent by a local PostgreSQL server: the postmaster's own and its reaped children's (utime, stime,
/// cutime, cstime of /proc/PID/stat) plus every live child's (backends, parallel workers, background
/// processes). Taking the difference of two readings gives the server's CPU over that span, including
/// backends that ended in between. Zero when the server is not on this machine.
/// </summary>
internal sealed class ServerCpu(int postmasterPid)
{
    // /proc reports clock ticks in USER_HZ, which the kernel fixes at 100 for user space on Linux.
    private const double TicksPerSecond = 100.0;

    public int PostmasterPid => postmasterPid;

    /// <summary>The server of a backend: the parent of that backend's process, if it is visible here.</summary>
    public static ServerCpu? ForBackend(int backendPid)
    {
        var status = $"/proc/{backendPid.ToString(CultureInfo.InvariantCulture)}/status";
        if (!File.Exists(status))
        {
            return null;
        }

        var ppid = File.ReadLines(status).FirstOrDefault(l => l.StartsWith("PPid:", StringComparison.Ordinal));
        return ppid is null ? null : new ServerCpu(int.Parse(ppid[5..].Trim(), CultureInfo.InvariantCulture));
    }

    public TimeSpan Read()
    {
        long ticks = 0;
        foreach (var dir in Directory.EnumerateDirectories("/proc"))
        {
            if (!int.TryParse(Path.GetFileName(dir), NumberStyles.None, CultureInfo.InvariantCulture, out var pid))
            {
                continue;
            }

            var fields = ReadStat(pid);
            if (fields is null)
            {
                continue;
            }

            // Fields after the command name, numbered as in proc(5) minus 3: [1] ppid, [11] utime, [12] stime, [13] cutime, [14] cstime.
            var ppid = int.Parse(fields[1], CultureInfo.InvariantCulture);
            if (pid == postmasterPid)
            {
                ticks += Sum(fields, 11, 12, 13, 14);
            }
            else if (ppid == postmasterPid)
            {
                ticks += Sum(fields, 11, 12);
            }
        }

        return TimeSpan.FromSeconds(ticks / TicksPerSecond);
    }

    private static string[]? ReadStat(int pid)
    {
        try
        {
            var text = File.ReadAllText($"/proc/{pid.ToString(CultureInfo.InvariantCulture)}/stat");

            // The command name is in parentheses and may hold spaces; the fields start after the last ')'.
            return text[(text.LastIndexOf(')') + 2)..].Split(' ');
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return null; // the process ended while we looked
        }
    }

    private static long Sum(string[] fields, params int[] indices) =>
        indices.Sum(i => long.Parse(fields[i], CultureInfo.InvariantCulture));
}
