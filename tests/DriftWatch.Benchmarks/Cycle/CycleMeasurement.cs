using System.Diagnostics;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>What one span of work cost: wall time, this process's CPU, the database server's CPU, this process's peak RSS.</summary>
internal sealed record CycleMeasurement(TimeSpan Wall, TimeSpan ClientCpu, TimeSpan? ServerCpu, long PeakRssBytes, string LoadAverage)
{
    public static async Task<(T Result, CycleMeasurement Measurement)> MeasureAsync<T>(ServerCpu? server, Func<Task<T>> work)
    {
        ProcessMemory.TryResetPeak();
        using var process = Process.GetCurrentProcess();
        var cpuBefore = process.TotalProcessorTime;
        var serverBefore = server?.Read();
        var stopwatch = Stopwatch.StartNew();
        var result = await work();
        stopwatch.Stop();
        process.Refresh();
        var measurement = new CycleMeasurement(
            stopwatch.Elapsed,
            process.TotalProcessorTime - cpuBefore,
            server?.Read() - serverBefore,
            ProcessMemory.PeakResidentBytes(),
            ReadLoadAverage());
        return (result, measurement);
    }

    /// <summary>The 1-, 5- and 15-minute load averages, as uptime prints them.</summary>
    public static string ReadLoadAverage() =>
        File.Exists("/proc/loadavg") ? string.Join(' ', File.ReadAllText("/proc/loadavg").Split(' ').Take(3)) : "n/a";

    public string Format() =>
        $"wall {Wall.TotalSeconds,6:0.00} s | client CPU {ClientCpu.TotalSeconds,6:0.00} s | server CPU {(ServerCpu is { } s ? $"{s.TotalSeconds,6:0.00} s" : "   n/a")} | peak RSS {PeakRssBytes / 1048576.0,5:0} MB | load {LoadAverage}";
}
