using BenchmarkDotNet.Attributes;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Benchmarks.Engine;

/// <summary>
/// The comparison of a current extract with its baseline, profiles given: every rule plus the two
/// Kolmogorov–Smirnov tests, which sort both samples of both columns. A check costs one profile plus this.
/// </summary>
[Config(typeof(EngineConfig))]
public class ComparisonBenchmarks
{
    private PairedSample _current = PairedSample.Empty;
    private PairedSample _baseline = PairedSample.Empty;
    private RelationshipProfile _currentProfile = new();
    private RelationshipProfile _baselineProfile = new();

    [Params(10_000, 1_000_000)]
    public int Rows { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        _baseline = EngineData.Pair(Rows, seed: 1);
        _current = EngineData.Pair(Rows, seed: 2, slope: 2.2);
        _baselineProfile = Profiler.Profile(_baseline, Thresholds.Default);
        _currentProfile = Profiler.Profile(_current, Thresholds.Default);
    }

    [Benchmark]
    public IReadOnlyList<Finding> Assess() =>
        FindingEngine.Assess(_currentProfile, _current, _baselineProfile, _baseline, PairDeclaration.None, Thresholds.Default);
}
