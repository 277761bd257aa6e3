using BenchmarkDotNet.Running;

namespace DriftWatch.Benchmarks;

// `dotnet run -c Release --project tests/DriftWatch.Benchmarks -- --filter '*'` runs them all;
// figures go into docs/performance.md with the machine and date.
internal static class BenchmarkProgram
{
    public static async Task<int> Main(string[] args)
    {
        // `-- cycle [--pairs 1000]`: one whole monitor cycle, timed by a Stopwatch (see Cycle/CycleCommand.cs).
        if (args.Length > 0 && args[0] == Cycle.CycleCommand.Name)
        {
            return await Cycle.CycleCommand.RunAsync(args[1..]);
        }

        // `-- shared-read`: one table's shared read of 10 and 100 pairs against PostgreSQL's corr (see Cycle/SharedReadCommand.cs).
        if (args.Length > 0 && args[0] == Cycle.SharedReadCommand.Name)
        {
            return await Cycle.SharedReadCommand.RunAsync(args[1..]);
        }

        // `-- calibrate [--quick]`: false findings, confirmed alerts and detection of the statistics (see Calibration/CalibrateCommand.cs).
        if (args.Length > 0 && args[0] == Calibration.CalibrateCommand.Name)
        {
            return await Calibration.CalibrateCommand.RunAsync(args[1..]);
        }

        BenchmarkSwitcher.FromAssembly(typeof(BenchmarkProgram).Assembly).Run(args);
        return 0;
    }
}
