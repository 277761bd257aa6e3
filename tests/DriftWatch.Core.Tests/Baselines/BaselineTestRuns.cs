using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using MathNet.Numerics.Statistics;

namespace DriftWatch.Core.Tests.Baselines;

/// <summary>Run records for baseline tests, and a profiler whose figures come from MathNet.Numerics (an independent library).</summary>
internal static class BaselineTestRuns
{
    public static readonly DateTimeOffset T0 = new(2026, 3, 1, 0, 0, 0, TimeSpan.Zero);

    public static RelationshipProfile MathNetProfile(PairedSample sample) => new()
    {
        NRows = sample.RowCount,
        NUsed = sample.UsedCount,
        NNull = sample.NullCount,
        NNonfinite = sample.NonFiniteCount,
        NNonNumeric = sample.NonNumericCount,
        XMean = sample.UsedCount == 0 ? null : sample.X.Mean(),
        YMean = sample.UsedCount == 0 ? null : sample.Y.Mean(),
        PearsonR = sample.UsedCount < 3 ? null : Correlation.Pearson(sample.X, sample.Y),
    };

    /// <summary>A succeeded run started <paramref name="hours"/> after <see cref="T0"/> holding the given points.</summary>
    public static RunRecord Run(long id, double hours, double[] x, double[] y, Severity? worst = null, int nulls = 0, RunStatus status = RunStatus.Succeeded, bool withPoints = true)
    {
        var points = new PairedSample(x, y, nulls);
        var findings = worst is { } s ? new[] { new Finding(FindingKind.CorrelationShift, s, 0.001, 0.3, "test finding") } : [];
        var started = T0.AddHours(hours);
        return new RunRecord(
            id,
            "orders.amount_vs_tax",
            started,
            started.AddSeconds(2),
            status,
            status == RunStatus.Failed ? "boom" : null,
            status == RunStatus.Failed ? null : MathNetProfile(points),
            findings,
            null,
            withPoints && status == RunStatus.Succeeded ? points : null,
            "all");
    }

    /// <summary>n points (i + offset, 2(i + offset) + 1): a line, so pooled figures are easy to cross-check.</summary>
    public static RunRecord LineRun(long id, double hours, int n, int offset = 0, Severity? worst = null, int nulls = 0, RunStatus status = RunStatus.Succeeded, bool withPoints = true)
    {
        var x = Enumerable.Range(offset, n).Select(i => (double)i).ToArray();
        var y = x.Select(v => (2 * v) + 1).ToArray();
        return Run(id, hours, x, y, worst, nulls, status, withPoints);
    }
}
