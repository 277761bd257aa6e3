using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Baselines;

/// <summary>
/// One baseline run's own figures, kept so a check is compared with the normal range of runs (sampling error
/// plus the spread the baseline's runs showed between themselves), not with one pooled sample.
/// </summary>
/// <remarks>
/// Linear figures (r, slope, intercept, means, x's SD, residual SD) are the exact whole-window figures of the
/// source's push-down aggregate when the run has them (<see cref="Exact"/>), else the sample's. Their standard
/// errors are then those of a sample of <see cref="Used"/> rows: the sample's robust slope SE scaled by
/// √(sample n / window n). Shape figures (ρ, outlier rate, curvature) always come from the sample.
/// </remarks>
/// <param name="Exact">The linear figures are the exact whole-window ones.</param>
/// <param name="Rows">Rows in the window, usable or not (the source's exact count when it gave one).</param>
/// <param name="Used">Rows with a finite x and y (the source's exact count when it gave one).</param>
/// <param name="SampleUsed">Usable rows of the sample the shape figures come from.</param>
/// <param name="SlopeSe">Robust (HC1) standard error of <see cref="Slope"/>, for a sample of <see cref="Used"/> rows.</param>
/// <param name="CurvatureGain">R² the quadratic adds over the line (0 when the quadratic is undefined).</param>
/// <param name="IsExactFunction">The sample was an exact affine or monotone function.</param>
/// <param name="Leverage">One row dominated the sample's line.</param>
/// <param name="LineDisagrees">The exact whole-window line and the sample's line disagreed beyond sampling error.</param>
/// <param name="DerivedShare">Share of the sample's rows lying exactly on one line.</param>
public sealed record RunFigures(
    long RunId,
    DateTimeOffset StartedAt,
    bool Exact,
    long Rows,
    long Used,
    int SampleUsed,
    double? R,
    double? Rho,
    double? Slope,
    double? SlopeSe,
    double? Intercept,
    double? XMean,
    double? XSd,
    double? YMean,
    double? ResidualSd,
    double? OutlierRate,
    double? CurvatureGain,
    bool IsExactFunction,
    bool Leverage = false,
    bool LineDisagrees = false,
    double? DerivedShare = null)
{
    /// <summary>Share of the window's rows without a usable x or y.</summary>
    public double DropRate => Rows > 0 ? (double)(Rows - Used) / Rows : 0;

    /// <summary>Mean of a figure over the runs that have it (finite values only); null when none has it.</summary>
    public static double? Mean(IEnumerable<RunFigures> runs, Func<RunFigures, double?> figure)
    {
        var values = Values(runs, figure);
        return values.Length == 0 ? null : values.Average();
    }

    /// <summary>Sample standard deviation (n − 1) of a figure between runs; null with fewer than two runs having it.</summary>
    public static double? Spread(IEnumerable<RunFigures> runs, Func<RunFigures, double?> figure)
    {
        var values = Values(runs, figure);
        if (values.Length < 2)
        {
            return null;
        }

        double mean = values.Average();
        return Math.Sqrt(values.Sum(v => (v - mean) * (v - mean)) / (values.Length - 1));
    }

    private static double[] Values(IEnumerable<RunFigures> runs, Func<RunFigures, double?> figure)
    {
        ArgumentNullException.ThrowIfNull(runs);
        ArgumentNullException.ThrowIfNull(figure);
        return [.. runs.Select(figure).Where(v => v is { } d && double.IsFinite(d)).Select(v => v!.Value)];
    }

    /// <summary>Sampling variance of <see cref="Slope"/>; null when undefined.</summary>
    public double? SlopeVariance => SlopeSe is { } se ? se * se : null;

    /// <summary>
    /// A run's figures from its profile and, when the source computed them, its exact whole-window figures.
    /// Row counts are exact whenever the source counted them; the exact line is used only when it is complete.
    /// </summary>
    public static RunFigures Of(long runId, DateTimeOffset startedAt, RelationshipProfile profile, SourceFigures? exact, Thresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(thresholds);
        bool leverage = ProfileFindings.IsLeverage(profile, thresholds);
        bool disagrees = SampleAgreement.Test(profile, exact, thresholds) is { Disagrees: true };
        double? robustSe = profile.SlopeSeRobust ?? profile.SlopeSe;
        bool exactUsable = exact is { UsedCount: > 2, PearsonR: not null, Slope: not null, Intercept: not null, XMean: not null, YMean: not null, XVariance: > 0, YVariance: > 0 }
            && profile.NUsed > 2;
        long rows = exact?.RowCount ?? profile.NRows, used = exact?.UsedCount ?? profile.NUsed;
        if (!exactUsable)
        {
            return new RunFigures(
                runId, startedAt, false, rows, used, profile.NUsed,
                profile.PearsonR, profile.SpearmanRho, profile.Slope, robustSe, profile.Intercept,
                profile.XMean, profile.XSd, profile.YMean, profile.ResidualSd,
                profile.OutlierRate, profile.QuadraticR2Gain ?? 0, profile.ExactAffine || profile.ExactMonotone, leverage, disagrees, profile.DerivedShare);
        }

        var f = exact!;
        double r = f.PearsonR!.Value;
        double sdx = Math.Sqrt(f.XVariance!.Value), sdy = Math.Sqrt(f.YVariance!.Value);
        long n = f.UsedCount;

        // Residual SD of the exact line from the exact moments: s² = var(y)(1 − r²)(n − 1)/(n − 2).
        double residualSd = sdy * Math.Sqrt(Math.Max(0, 1 - (r * r)) * (n - 1) / (n - 2));
        double? slopeSe = robustSe is { } se && profile.NUsed < n ? se * Math.Sqrt(profile.NUsed / (double)n) : robustSe;
        return new RunFigures(
            runId, startedAt, true, f.RowCount, f.UsedCount, profile.NUsed,
            r, profile.SpearmanRho, f.Slope, slopeSe, f.Intercept,
            f.XMean, sdx, f.YMean, residualSd,
            profile.OutlierRate, profile.QuadraticR2Gain ?? 0, profile.ExactAffine || profile.ExactMonotone, leverage, disagrees, profile.DerivedShare);
    }
}
