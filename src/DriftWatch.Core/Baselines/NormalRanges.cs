using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Baselines;

/// <summary>
/// The normal range of each figure a trend chart shows, computed as the comparison computes it
/// (<see cref="RunSpread"/> over the baseline's runs, each with its sampling variance, the same scale per
/// figure) for one new run whose sampling error is the runs' typical one. A run outside the band is what the
/// comparison would call unusual at that alpha; the comparison itself also weighs the run's own size.
/// </summary>
public static class NormalRanges
{
    /// <summary>Pearson r: on Fisher's z with variance 1/(n − 3), back-transformed, so within [−1, 1].</summary>
    public static NormalRange? R(IReadOnlyList<RunFigures> runs, double alpha)
    {
        var values = Runs(runs).Where(r => r.R is not null && r.Used > 3)
            .Select(r => (Correlation.FisherZ(r.R!.Value), 1.0 / (r.Used - 3))).ToArray();
        return Of(values, alpha) is { } z ? new NormalRange(Math.Tanh(z.Centre), Math.Tanh(z.Low), Math.Tanh(z.High)) : null;
    }

    /// <summary>The slope with its robust (HC1) sampling variance.</summary>
    public static NormalRange? Slope(IReadOnlyList<RunFigures> runs, double alpha) =>
        Of(Runs(runs).Where(r => r.Slope is not null && r.SlopeVariance is not null).Select(r => (r.Slope!.Value, r.SlopeVariance!.Value)), alpha);

    /// <summary>
    /// The intercept with the variance of the line at x = 0, s²/n + SE(b)²·x̄² (the comparison tests the line at
    /// the baseline's mean x instead, where the data are; the intercept is what the fitted equation shows).
    /// </summary>
    public static NormalRange? Intercept(IReadOnlyList<RunFigures> runs, double alpha) =>
        Of(Runs(runs).Where(r => r is { Intercept: not null, ResidualSd: not null, XMean: not null, SlopeVariance: not null, Used: >= 3 })
            .Select(r => (r.Intercept!.Value, (r.ResidualSd!.Value * r.ResidualSd.Value / r.Used) + (r.SlopeVariance!.Value * r.XMean!.Value * r.XMean.Value))), alpha);

    /// <summary>The outlier rate with the binomial variance p(1 − p)/n of the runs' pooled rate.</summary>
    public static NormalRange? OutlierRate(IReadOnlyList<RunFigures> runs, double alpha)
    {
        var kept = Runs(runs).Where(r => r.OutlierRate is not null).ToArray();
        if (kept.Length == 0)
        {
            return null;
        }

        double pooled = Math.Max(kept.Average(r => r.OutlierRate!.Value), 1.0 / Math.Max(1, kept.Average(r => r.SampleUsed)));
        var range = Of(kept.Select(r => (r.OutlierRate!.Value, pooled * (1 - pooled) / Math.Max(1, r.SampleUsed))), alpha);
        return range is null ? null : range with { Low = Math.Max(0, range.Low), High = Math.Min(1, range.High) };
    }

    /// <summary>Usable rows on a log scale with variance 1/n (a Poisson count), back-transformed.</summary>
    public static NormalRange? RowCount(IReadOnlyList<RunFigures> runs, double alpha) =>
        Of(Runs(runs).Where(r => r.Used > 0).Select(r => (Math.Log(r.Used), 1.0 / r.Used)), alpha) is { } log
            ? new NormalRange(Math.Exp(log.Centre), Math.Exp(log.Low), Math.Exp(log.High))
            : null;

    private static IEnumerable<RunFigures> Runs(IReadOnlyList<RunFigures> runs)
    {
        ArgumentNullException.ThrowIfNull(runs);
        return runs;
    }

    private static NormalRange? Of(IEnumerable<(double Value, double Variance)> values, double alpha)
    {
        var kept = values.Where(v => double.IsFinite(v.Value) && double.IsFinite(v.Variance) && v.Variance >= 0).ToArray();
        if (kept.Length == 0)
        {
            return null;
        }

        // A new run of the runs' typical sampling error: RunSpread's "current variance" is their mean.
        double typical = kept.Average(v => v.Variance);
        if (RunSpread.Of(kept, typical) is not { } spread)
        {
            return null;
        }

        double half = spread.HalfWidth(alpha);
        return double.IsFinite(half) ? new NormalRange(spread.Centre, spread.Centre - half, spread.Centre + half) : null;
    }
}
