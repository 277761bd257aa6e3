using DriftWatch.Core.Statistics;
using DriftWatch.Output;

namespace DriftWatch.Plots;

/// <summary>The sentence under a scatter picture: what is drawn, what was left at the edge, and what to look for.</summary>
internal static class ScatterCaption
{
    public static string Of(ScatterPlotModel model, Thresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(thresholds);
        if (model.IsEmpty)
        {
            return "No sampled points to show yet.";
        }

        var parts = new List<string>();
        var drawn = model.Series.Select(s => s.Name == "baseline"
            ? $"grey open circles: the baseline ({Figures.Count(s.Count)} points, from all the runs it pools)"
            : $"teal dots: the latest run ({Figures.Count(s.Count)} points)");
        parts.Add(Capitalise(string.Join("; ", drawn)) + ".");
        parts.Add(model.Series.Any(s => s.Fit is { Quadratic: true })
            ? "Curves: the least-squares parabola where the profile found curvature, else the straight line."
            : "Lines: least-squares fits.");
        var hidden = model.Series.Where(s => s.Fit is { } f && f.Points.All(p => !model.Y.Contains(p.Y))).Select(s => s.Name).ToArray();
        if (hidden.Length > 0)
        {
            parts.Add($"The {string.Join(" and ", hidden)} fit runs outside the drawn range (pulled there by off-scale values); its equation is in the legend.");
        }

        var outlying = model.Series.Sum(s => s.Outlying.Count);
        if (outlying > 0)
        {
            parts.Add($"× marks {Points(outlying)} more than {Figures.Coefficient(thresholds.OutlierT)} studentized residuals off their line.");
        }

        if (model.OffScale.Count > 0)
        {
            var shown = model.Labels.Count;
            var groups = model.OffScale.Select(p => ScatterPlotModelBuilder.Text(p, model.XName, model.YName)).Distinct().Count();
            var more = groups > shown ? $", {Figures.Count(groups - shown)} more values not labelled" : string.Empty;
            parts.Add($"{Points(model.OffScale.Count)} far outside the bulk {(model.OffScale.Count == 1 ? "is" : "are")} drawn as triangles at the edge, labelled with their values{more}.");
        }

        parts.Add("Look for the teal fit leaving the grey one (a changed slope or offset), a bend, and clusters of × or edge triangles (placeholder values, unit or entry errors).");
        return string.Join(" ", parts);
    }

    private static string Points(int count) => count == 1 ? "1 point" : $"{Figures.Count(count)} points";

    private static string Capitalise(string text) => text.Length == 0 ? text : char.ToUpperInvariant(text[0]) + text[1..];
}
