using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Output;

namespace DriftWatch.Alerting.Digest;

/// <summary>
/// One row of the baseline-versus-current table: the words people read (<paramref name="Baseline"/>,
/// <paramref name="Current"/>, formatted by Output/Figures) and, for machine readers (the webhook document), the
/// figure's snake_case <see cref="Key"/> and unformatted values (null where the text shows "—").
/// </summary>
internal sealed record FigureRow(string Name, string Baseline, string Current)
{
    public string Key { get; init; } = "";

    public double? BaselineValue { get; init; }

    public double? CurrentValue { get; init; }
}

/// <summary>
/// The small table every pair in a digest gets: rows, r, ρ, slope, curvature p, outlier rate, nulls. The baseline
/// column is the baseline the run was judged against (the means over its runs, recorded with the run) where the
/// run recorded one; rows are the window's exact count where the source computed it, not the sample's size.
/// </summary>
internal static class DigestFigures
{
    public static IReadOnlyList<FigureRow> Rows(AlertPairContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        RelationshipProfile? baseline = context.Baseline, current = context.Current;
        var judged = context.JudgedAgainst;
        var window = context.Window;
        FigureRow size;
        if (window is not null || judged?.Rows is not null)
        {
            double? before = judged?.Rows is { } rows ? Math.Round(rows) : baseline?.NRows;
            double? now = window is not null ? window.RowCount : current?.NRows;
            size = new FigureRow(
                "rows in the window",
                before is { } b ? Figures.Count((long)b) : Figures.Missing,
                now is { } n ? Figures.Count((long)n) : Figures.Missing)
            {
                Key = "rows",
                BaselineValue = judged?.Rows is { } mean ? mean : before,
                CurrentValue = now,
            };
        }
        else
        {
            size = Row("rows_used", "rows used (n)", baseline, current, p => p.NUsed, p => Figures.Count(p.NUsed));
        }

        return
        [
            size with { Baseline = PerRun(size.Baseline, judged) },
            judged is not null
                ? Judged("pearson_r", "Pearson r", judged.PearsonR, current?.PearsonR, Figures.Correlation)
                : Row("pearson_r", "Pearson r", baseline, current, p => p.PearsonR, p => Figures.Correlation(p.PearsonR)),
            Row("spearman_rho", "Spearman ρ", baseline, current, p => p.SpearmanRho, p => Figures.Correlation(p.SpearmanRho)),
            judged is not null
                ? Judged("slope", "slope", judged.Slope, current?.Slope, Figures.Number)
                : Row("slope", "slope", baseline, current, p => p.Slope, p => Figures.Number(p.Slope)),
            Row("curvature_p", "curvature p", baseline, current, p => p.QuadraticP, p => Figures.PValue(p.QuadraticP)),
            Row("outlier_rate", "outlier rate", baseline, current, p => p.OutlierRate, p => Figures.Percent(p.OutlierRate)),
            Row("null_rate", "nulls", baseline, current, p => p.NRows > 0 ? (double)p.NNull / p.NRows : null, Nulls),
        ];
    }

    /// <summary>
    /// A pooled baseline's row count is one run's (the mean over its runs), while its plot draws the points of all
    /// its runs: say so, so the table and the legend do not seem to disagree.
    /// </summary>
    internal static string PerRun(string cell, BaselineSummary? judged) =>
        judged is { RunCount: > 1 } && cell != Figures.Missing ? $"{cell} per run ({Figures.Count(judged.RunCount)} runs)" : cell;

    private static FigureRow Row(
        string key, string name, RelationshipProfile? baseline, RelationshipProfile? current, Func<RelationshipProfile, double?> value, Func<RelationshipProfile, string> figure) =>
        new(name, baseline is null ? Figures.Missing : figure(baseline), current is null ? Figures.Missing : figure(current))
        {
            Key = key,
            BaselineValue = baseline is null ? null : Finite(value(baseline)),
            CurrentValue = current is null ? null : Finite(value(current)),
        };

    private static FigureRow Judged(string key, string name, double? baseline, double? current, Func<double?, string> figure) =>
        new(name, figure(baseline), current is null ? Figures.Missing : figure(current))
        {
            Key = key,
            BaselineValue = Finite(baseline),
            CurrentValue = Finite(current),
        };

    private static double? Finite(double? value) => value is { } v && double.IsFinite(v) ? v : null;

    private static string Nulls(RelationshipProfile p) =>
        p.NRows > 0
            ? $"{Figures.Count(p.NNull)} ({Figures.Percent((double)p.NNull / p.NRows)})"
            : Figures.Count(p.NNull);
}
