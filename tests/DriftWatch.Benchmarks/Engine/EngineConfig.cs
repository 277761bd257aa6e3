using BenchmarkDotNet.Configs;
using BenchmarkDotNet.Diagnosers;
using BenchmarkDotNet.Jobs;

namespace DriftWatch.Benchmarks.Engine;

/// <summary>
/// The engine's speed goals are for one core (≤ 3 ms at 10,000 rows, ≤ 0.4 s at 1,000,000), so the
/// job is pinned to the first CPU; a short run is enough for figures of this size.
/// </summary>
public sealed class EngineConfig : ManualConfig
{
    public EngineConfig()
    {
        AddJob(Job.ShortRun.WithAffinity(1).WithId("one-core"));
        AddDiagnoser(MemoryDiagnoser.Default);
    }
}
