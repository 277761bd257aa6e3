namespace DriftWatch.Plots;

/// <summary>
/// Everything a scatter picture shows, decided once for both renderers (PNG for mail, SVG for the dashboard):
/// the axis ranges, each series' points split into ordinary, outlying and off-scale, the fitted line or
/// parabola with its equation, the labels of off-scale values and the caption that says what to look at.
/// </summary>
internal sealed record ScatterPlotModel(
    string XName,
    string YName,
    string? Title,
    AxisRange X,
    AxisRange Y,
    IReadOnlyList<ScatterSeries> Series,
    IReadOnlyList<OffScalePoint> OffScale,
    IReadOnlyList<OffScaleLabel> Labels,
    string Caption)
{
    public bool IsEmpty => Series.All(s => s.Count == 0);
}

/// <summary>One sample: <paramref name="Name"/> is "baseline" or "current"; <paramref name="Count"/> counts every usable row of it.</summary>
internal sealed record ScatterSeries(
    string Name,
    int Count,
    IReadOnlyList<PlotPoint> Ordinary,
    IReadOnlyList<PlotPoint> Outlying,
    FitCurve? Fit);

internal readonly record struct PlotPoint(double X, double Y);

/// <summary>A fitted line (two points) or parabola (many), already limited to the drawn x range.</summary>
internal sealed record FitCurve(IReadOnlyList<PlotPoint> Points, string Equation, bool Quadratic);

/// <summary>Where an off-scale point lies beyond the axes.</summary>
[Flags]
internal enum OffScaleSide
{
    None = 0,
    Above = 1,
    Below = 2,
    Left = 4,
    Right = 8,
}

/// <summary>A point beyond the axis range: its true values, the spot at the edge where it is drawn, which side it left by.</summary>
internal sealed record OffScalePoint(string Series, double X, double Y, PlotPoint Drawn, OffScaleSide Side);

/// <summary>A text at the edge naming the values of a group of off-scale points.</summary>
internal sealed record OffScaleLabel(PlotPoint At, string Text, OffScaleSide Side);
