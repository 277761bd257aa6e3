using DriftWatch.Core.Profiling;

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
        return
        [
            window is not null || judged?.Rows is not null
                ? new FigureRow(
                    "rows in the window",
                    judged?.Rows is { } rows ? FigureFormat.Count((long)Math.Round(rows)) : baseline is null ? FigureFormat.Missing : FigureFormat.Count(baseline.NRows),
                    window is not null ? FigureFormat.Count(window.RowCount) : current is null ? FigureFormat.Missing : FigureFormat.Count(current.NRows))
                : Row("rows used (n)", baseline, current, p => FigureFormat.Count(p.NUsed)),
            judged is not null
                ? new FigureRow("Pearson r", FigureFormat.Correlation(judged.PearsonR), current is null ? FigureFormat.Missing : FigureFormat.Correlation(current.PearsonR))
                : Row("Pearson r", baseline, current, p => FigureFormat.Correlation(p.PearsonR)),
            Row("Spearman ρ", baseline, current, p => FigureFormat.Correlation(p.SpearmanRho)),
            judged is not null
                ? new FigureRow("slope", FigureFormat.Number(judged.Slope), current is null ? FigureFormat.Missing : FigureFormat.Number(current.Slope))
                : Row("slope", baseline, current, p => FigureFormat.Number(p.Slope)),
            Row("curvature p", baseline, current, p => FigureFormat.PValue(p.QuadraticP)),
            Row("outlier rate", baseline, current, p => FigureFormat.Percent(p.OutlierRate)),
            Row("nulls", baseline, current, Nulls),
        ];
    }

    private static FigureRow Row(string name, RelationshipProfile? baseline, RelationshipProfile? current, Func<RelationshipProfile, string> figure) =>
        new(name, baseline is null ? FigureFormat.Missing : figure(baseline), current is null ? FigureFormat.Missing : figure(current));

    private static string Nulls(RelationshipProfile p) =>
        p.NRows > 0
            ? $"{FigureFormat.Count(p.NNull)} ({FigureFormat.Percent((double)p.NNull / p.NRows)})"
            : FigureFormat.Count(p.NNull);
}
