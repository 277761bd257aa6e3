using BenchmarkDotNet.Attributes;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Benchmarks.Engine;

/// <summary>
/// The steps of <see cref="ProfileBenchmarks.Profile"/> one by one on the same extract (10,000 rows, the default
/// sample): where a check's own CPU goes. The sum is not the profile's time exactly (the profile skips steps for
/// some shapes and shares a few intermediate results), but the order of the steps is what matters.
/// </summary>
/// <remarks>Steps return object: their types are internal to the engine, and a public benchmark cannot name them.</remarks>
[Config(typeof(EngineConfig))]
public class ProfileStepsBenchmarks
{
    private PairedSample _sample = PairedSample.Empty;
    private double[] _x = [];
    private double[] _y = [];
    private Ranking _rankX = null!;
    private Ranking _rankY = null!;
    private CenteredColumn _cx = null!;
    private CenteredColumn _cy = null!;
    private LineFit _line = null!;

    [GlobalSetup]
    public void Setup()
    {
        _sample = EngineData.Pair(10_000, seed: 1);
        var rows = UsableRows.Of(_sample);
        (_x, _y) = (rows.X, rows.Y);
        _rankX = Ranking.Of(_x);
        _rankY = Ranking.Of(_y);
        _cx = CenteredColumn.Of(_x);
        _cy = CenteredColumn.Of(_y);
        _line = LineFit.Of(_cx.Deviations, _cy.Deviations, _cx.SumSquares, _cy.SumSquares);
    }

    [Benchmark(Baseline = true)]
    public RelationshipProfile WholeProfile() => Profiler.Profile(_sample, Thresholds.Default);

    [Benchmark]
    public object RanksOfX() => Ranking.Of(_x);

    [Benchmark]
    public object CentringOfX() => CenteredColumn.Of(_x);

    [Benchmark]
    public object Line() => LineFit.Of(_cx.Deviations, _cy.Deviations, _cx.SumSquares, _cy.SumSquares);

    [Benchmark]
    public double? Kendall() => KendallTau.TauB(_rankX, _rankY);

    [Benchmark]
    public object? Quadratic() => QuadraticFit.Of(_cx.Deviations, _cy.Deviations, _line, _rankX.Distinct);

    [Benchmark]
    public object InfluenceMeasures() => Influence.Of(_cx.Deviations, _line, Thresholds.DefaultOutlierT);

    [Benchmark]
    public (double, double, double)? PartlyDerivedRows() => DerivedRows.Of(_x, _y, Thresholds.DefaultExactRelativeTolerance * _cy.StandardDeviation);
}
