using BenchmarkDotNet.Attributes;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Benchmarks.Engine;

/// <summary>The full profile of one extract: moments, three correlations, OLS, quadratic QR, influence, exactness, shape.</summary>
[Config(typeof(EngineConfig))]
public class ProfileBenchmarks
{
    private PairedSample _sample = PairedSample.Empty;

    [Params(10_000, 1_000_000)]
    public int Rows { get; set; }

    [GlobalSetup]
    public void Setup() => _sample = EngineData.Pair(Rows, seed: 1);

    [Benchmark]
    public RelationshipProfile Profile() => Profiler.Profile(_sample, Thresholds.Default);
}
