using DriftWatch.Core.Profiling;

namespace DriftWatch.Alerts.Email;

/// <summary>One row of the baseline-versus-current table.</summary>
internal sealed record FigureRow(string Name, string Baseline, string Current);

/// <summary>The small table every pair in a digest gets: n, r, ρ, slope, curvature p, outlier rate, nulls.</summary>
internal static class DigestFigures
{
    public static IReadOnlyList<FigureRow> Rows(RelationshipProfile? baseline, RelationshipProfile? current) =>
    [
        Row("rows used (n)", baseline, current, p => FigureFormat.Count(p.NUsed)),
        Row("Pearson r", baseline, current, p => FigureFormat.Correlation(p.PearsonR)),
        Row("Spearman ρ", baseline, current, p => FigureFormat.Correlation(p.SpearmanRho)),
        Row("slope", baseline, current, p => FigureFormat.Number(p.Slope)),
        Row("curvature p", baseline, current, p => FigureFormat.PValue(p.QuadraticP)),
        Row("outlier rate", baseline, current, p => FigureFormat.Percent(p.OutlierRate)),
        Row("nulls", baseline, current, Nulls),
    ];

    private static FigureRow Row(string name, RelationshipProfile? baseline, RelationshipProfile? current, Func<RelationshipProfile, string> figure) =>
        new(name, baseline is null ? FigureFormat.Missing : figure(baseline), current is null ? FigureFormat.Missing : figure(current));

    private static string Nulls(RelationshipProfile p) =>
        p.NRows > 0
            ? $"{FigureFormat.Count(p.NNull)} ({FigureFormat.Percent((double)p.NNull / p.NRows)})"
            : FigureFormat.Count(p.NNull);
}
