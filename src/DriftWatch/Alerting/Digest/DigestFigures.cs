using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Output;

namespace DriftWatch.Alerting.Digest;

/// <summary>One row of the baseline-versus-current table.</summary>
internal sealed record FigureRow(string Name, string Baseline, string Current);

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
        var size = window is not null || judged?.Rows is not null
            ? new FigureRow(
                "rows in the window",
                judged?.Rows is { } rows ? Figures.Count((long)Math.Round(rows)) : baseline is null ? Figures.Missing : Figures.Count(baseline.NRows),
                window is not null ? Figures.Count(window.RowCount) : current is null ? Figures.Missing : Figures.Count(current.NRows))
            : Row("rows used (n)", baseline, current, p => Figures.Count(p.NUsed));
        return
        [
            size with { Baseline = PerRun(size.Baseline, judged) },
            judged is not null
                ? new FigureRow("Pearson r", Figures.Correlation(judged.PearsonR), current is null ? Figures.Missing : Figures.Correlation(current.PearsonR))
                : Row("Pearson r", baseline, current, p => Figures.Correlation(p.PearsonR)),
            Row("Spearman ρ", baseline, current, p => Figures.Correlation(p.SpearmanRho)),
            judged is not null
                ? new FigureRow("slope", Figures.Number(judged.Slope), current is null ? Figures.Missing : Figures.Number(current.Slope))
                : Row("slope", baseline, current, p => Figures.Number(p.Slope)),
            Row("curvature p", baseline, current, p => Figures.PValue(p.QuadraticP)),
            Row("outlier rate", baseline, current, p => Figures.Percent(p.OutlierRate)),
            Row("nulls", baseline, current, Nulls),
        ];
    }

    /// <summary>
    /// A pooled baseline's row count is one run's (the mean over its runs), while its plot draws the points of all
    /// its runs: say so, so the table and the legend do not seem to disagree.
    /// </summary>
    internal static string PerRun(string cell, BaselineSummary? judged) =>
        judged is { RunCount: > 1 } && cell != Figures.Missing ? $"{cell} per run ({Figures.Count(judged.RunCount)} runs)" : cell;

    private static FigureRow Row(string name, RelationshipProfile? baseline, RelationshipProfile? current, Func<RelationshipProfile, string> figure) =>
        new(name, baseline is null ? Figures.Missing : figure(baseline), current is null ? Figures.Missing : figure(current));

    private static string Nulls(RelationshipProfile p) =>
        p.NRows > 0
            ? $"{Figures.Count(p.NNull)} ({Figures.Percent((double)p.NNull / p.NRows)})"
            : Figures.Count(p.NNull);
}
