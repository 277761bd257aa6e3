using DriftWatch.Core.Baselines;

namespace DriftWatch.Core.History;

/// <summary>
/// The baseline a run was judged against, recorded with the run: a baseline is rebuilt as its policy says, so
/// the mail and the dashboard show the one that decided, not a later one. Figures are the means over the
/// baseline's runs (the centre comparisons test against); null where no run had the figure.
/// </summary>
public sealed record BaselineSummary(
    DateTimeOffset CreatedAt,
    DateTimeOffset CoversFrom,
    DateTimeOffset CoversTo,
    int RunCount,
    bool Accepted,
    double? PearsonR,
    double? Slope,
    double? Intercept,
    double? ResidualSd,
    double? Rows,
    double? OutlierRate)
{
    public static BaselineSummary Of(StoredBaseline baseline)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        IReadOnlyList<RunFigures> runs = baseline.Runs;
        double? Mean(Func<RunFigures, double?> figure) => RunFigures.Mean(runs, figure);

        var p = baseline.Profile;
        return runs.Count == 0
            ? new BaselineSummary(baseline.CreatedAt, baseline.CoversFrom, baseline.CoversTo, baseline.RunCount, baseline.Accepted, p.PearsonR, p.Slope, p.Intercept, p.ResidualSd, p.NRows, p.OutlierRate)
            : new BaselineSummary(
                baseline.CreatedAt, baseline.CoversFrom, baseline.CoversTo, baseline.RunCount, baseline.Accepted,
                Mean(r => r.R), Mean(r => r.Slope), Mean(r => r.Intercept), Mean(r => r.ResidualSd), Mean(r => r.Rows), Mean(r => r.OutlierRate));
    }
}
