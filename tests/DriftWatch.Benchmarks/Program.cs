using BenchmarkDotNet.Running;

namespace DriftWatch.Benchmarks;

// `dotnet run -c Release --project tests/DriftWatch.Benchmarks -- --filter '*'` runs them all;
// figures go into docs/performance.md with the machine and date.
internal static class BenchmarkProgram
{
    public static void Main(string[] args) => BenchmarkSwitcher.FromAssembly(typeof(BenchmarkProgram).Assembly).Run(args);
}
