using MathNet.Numerics.Distributions;

namespace DriftWatch.Core.Statistics;

/// <summary>
/// A figure of the current run against the same figure of the baseline's runs, each with its sampling
/// variance: is the current value inside the range the baseline's runs make plausible?
/// </summary>
/// <remarks>
/// The baseline runs differ by sampling error and by real day-to-day variation (a random effect, as in a
/// random-effects meta-analysis, DerSimonian and Laird 1986). Their sample variance s² estimates both
/// together, so the variance of (current − mean of k runs) is s²(1 + 1/k), plus whatever sampling error the
/// current run has beyond the runs' typical one; s² is floored at the runs' mean sampling variance (a few runs
/// can agree by chance). With k ≥ 2 the statistic is referred to Student's t on k − 1 degrees of freedom, the
/// prediction interval for one new observation (common practice); with one run (an accepted baseline, or a
/// pooled profile alone) it is the classic two-sample z test of the two sampling errors.
/// </remarks>
internal readonly record struct RunSpread(double Centre, double Variance, int Runs)
{
    /// <summary>Standard deviation of (current − centre) under "nothing changed".</summary>
    public double Sd => Math.Sqrt(Variance);

    /// <param name="runs">The baseline runs' values and sampling variances (non-finite ones are skipped).</param>
    /// <param name="currentVariance">The current run's sampling variance.</param>
    /// <returns>Null when no baseline run has the figure, or the variance is not positive.</returns>
    public static RunSpread? Of(IEnumerable<(double Value, double Variance)> runs, double currentVariance)
    {
        ArgumentNullException.ThrowIfNull(runs);
        var kept = runs.Where(r => double.IsFinite(r.Value) && double.IsFinite(r.Variance) && r.Variance >= 0).ToArray();
        int k = kept.Length;
        if (k == 0 || !double.IsFinite(currentVariance))
        {
            return null;
        }

        double centre = kept.Average(r => r.Value);
        double within = kept.Average(r => r.Variance);
        double variance;
        if (k == 1)
        {
            variance = within + currentVariance;
        }
        else
        {
            double s2 = kept.Sum(r => (r.Value - centre) * (r.Value - centre)) / (k - 1);
            double spread = Math.Max(s2, within) * (1 + (1.0 / k));
            variance = Math.Max(spread + (currentVariance - within), currentVariance + (within / k));
        }

        return variance > 0 && double.IsFinite(variance) ? new RunSpread(centre, variance, k) : null;
    }

    /// <summary>Two-sided p of the current value under "nothing changed".</summary>
    public double TwoSidedP(double current) => Math.Clamp(2 * UpperTail(Math.Abs(current - Centre) / Sd), 0, 1);

    /// <summary>One-sided p that the current value rose above the baseline's range.</summary>
    public double IncreaseP(double current) => UpperTail((current - Centre) / Sd);

    /// <summary>One-sided p that the current value fell below the baseline's range.</summary>
    public double DecreaseP(double current) => UpperTail((Centre - current) / Sd);

    /// <summary>The half-width of the two-sided (1 − alpha) prediction interval, in the figure's units.</summary>
    public double HalfWidth(double alpha) => Critical(alpha / 2) * Sd;

    private double UpperTail(double t)
    {
        if (double.IsNaN(t))
        {
            return 1;
        }

        // The lower tail at −t keeps the digits of tiny p-values (1 − CDF would round them to 0).
        return Runs >= 2 ? StudentT.CDF(0, 1, Runs - 1, -t) : Normal.CDF(0, 1, -t);
    }

    private double Critical(double upperTail) =>
        Runs >= 2 ? StudentT.InvCDF(0, 1, Runs - 1, 1 - upperTail) : Normal.InvCDF(0, 1, 1 - upperTail);
}
