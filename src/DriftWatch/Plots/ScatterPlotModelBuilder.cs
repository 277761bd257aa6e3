using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.Output;

namespace DriftWatch.Plots;

/// <summary>
/// Builds the <see cref="ScatterPlotModel"/> of a baseline-versus-current picture. Both samples share one pair
/// of robust axes (<see cref="RobustAxis"/>) so they compare at a glance; points flagged by the profile's
/// outlier rule (<see cref="OutlyingRows"/>) get their own marker; when a profile found curvature its sample's
/// least-squares parabola is drawn instead of the line.
/// </summary>
internal static class ScatterPlotModelBuilder
{
    public const int MaxPointsPerSeries = 2000;
    public const int MaxLabels = 4;
    public const int CurveSteps = 60;

    /// <summary>Where off-scale points sit: this share of the drawn range beyond the bulk, inside the axis.</summary>
    private const double EdgeOffset = 0.045;

    /// <summary>The axes reach this far beyond the bulk on a side with off-scale points.</summary>
    private const double EdgePadding = 0.09;

    public static ScatterPlotModel Build(ScatterPlotInput input, Thresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(input);
        ArgumentNullException.ThrowIfNull(thresholds);
        var samples = new[]
        {
            ("baseline", Thin(input.BaselinePoints), input.BaselinePoints?.UsedCount ?? 0, input.BaselineProfile),
            ("current", Thin(input.CurrentPoints), input.CurrentPoints?.UsedCount ?? 0, input.CurrentProfile),
        };

        var bulkX = RobustAxis.Bulk(samples.SelectMany(s => s.Item2.X)) ?? new AxisRange(0, 1);
        var bulkY = RobustAxis.Bulk(samples.SelectMany(s => s.Item2.Y)) ?? new AxisRange(0, 1);
        var allX = samples.SelectMany(s => s.Item2.X).ToArray();
        var allY = samples.SelectMany(s => s.Item2.Y).ToArray();
        var x = Axis(bulkX, allX);
        var y = Axis(bulkY, allY);

        var series = new List<ScatterSeries>();
        var offScale = new List<OffScalePoint>();
        foreach (var (name, (xs, ys), count, profile) in samples)
        {
            if (xs.Length == 0)
            {
                continue;
            }

            var outlying = OutlyingRows.Of(xs, ys, thresholds.OutlierT);
            var ordinary = new List<PlotPoint>();
            var flagged = new List<PlotPoint>();
            for (var i = 0; i < xs.Length; i++)
            {
                var side = Side(bulkX, bulkY, xs[i], ys[i]);
                if (side != OffScaleSide.None)
                {
                    offScale.Add(new OffScalePoint(name, xs[i], ys[i], Drawn(x, y, xs[i], ys[i], side), side));
                }
                else
                {
                    (outlying[i] ? flagged : ordinary).Add(new PlotPoint(xs[i], ys[i]));
                }
            }

            series.Add(new ScatterSeries(name, count, ordinary, flagged, Fit(profile, xs, ys, bulkX, thresholds)));
        }

        var labels = Labels(offScale, input.XName, input.YName);
        var model = new ScatterPlotModel(input.XName, input.YName, input.Title, x, y, series, offScale, labels, string.Empty);
        return model with { Caption = ScatterCaption.Of(model, thresholds) };
    }

    private static (double[] X, double[] Y) Thin(PairedSample? sample) =>
        sample is { UsedCount: > 0 } ? PlotFormat.Thin(sample.X, sample.Y, MaxPointsPerSeries) : ([], []);

    /// <summary>The padded bulk, reaching a little further on each side that has off-scale values to show there.</summary>
    private static AxisRange Axis(AxisRange bulk, double[] values)
    {
        var padded = RobustAxis.Pad(bulk);
        double span = Math.Max(padded.Span, double.Epsilon);
        double min = values.Any(v => v < bulk.Min) ? bulk.Min - (span * EdgePadding) : padded.Min;
        double max = values.Any(v => v > bulk.Max) ? bulk.Max + (span * EdgePadding) : padded.Max;
        return new AxisRange(min, max);
    }

    private static OffScaleSide Side(AxisRange bulkX, AxisRange bulkY, double x, double y) =>
        (y > bulkY.Max ? OffScaleSide.Above : OffScaleSide.None)
        | (y < bulkY.Min ? OffScaleSide.Below : OffScaleSide.None)
        | (x < bulkX.Min ? OffScaleSide.Left : OffScaleSide.None)
        | (x > bulkX.Max ? OffScaleSide.Right : OffScaleSide.None);

    private static PlotPoint Drawn(AxisRange x, AxisRange y, double px, double py, OffScaleSide side)
    {
        double inset = EdgeOffset / 2;
        double dy = side.HasFlag(OffScaleSide.Above) ? y.Max - (y.Span * inset)
            : side.HasFlag(OffScaleSide.Below) ? y.Min + (y.Span * inset)
            : py;
        double dx = side.HasFlag(OffScaleSide.Left) ? x.Min + (x.Span * inset)
            : side.HasFlag(OffScaleSide.Right) ? x.Max - (x.Span * inset)
            : px;
        return new PlotPoint(Math.Clamp(dx, x.Min, x.Max), Math.Clamp(dy, y.Min, y.Max));
    }

    /// <summary>
    /// The line of the profile (which saw the whole sample) or, when the profile found curvature, the parabola of
    /// the plotted points; drawn over the bulk's x range only, so a far x does not stretch it.
    /// </summary>
    private static FitCurve? Fit(RelationshipProfile? profile, double[] xs, double[] ys, AxisRange bulkX, Thresholds thresholds)
    {
        if (profile is null)
        {
            return null;
        }

        double from = Math.Max(bulkX.Min, xs.Min()), to = Math.Min(bulkX.Max, xs.Max());
        var inside = Enumerable.Range(0, xs.Length).Where(i => bulkX.Contains(xs[i])).ToArray();
        if (Curvature.Found(profile, thresholds)
            && QuadraticCurve.Fit([.. inside.Select(i => xs[i])], [.. inside.Select(i => ys[i])]) is { } curve)
        {
            var points = Enumerable.Range(0, CurveSteps + 1)
                .Select(k => from + ((to - from) * k / CurveSteps))
                .Select(px => new PlotPoint(px, curve.Evaluate(px)))
                .ToArray();
            return new FitCurve(points, FitEquation.Quadratic(curve.A, curve.B, curve.C), Quadratic: true);
        }

        if (profile is { Slope: { } slope, Intercept: { } intercept })
        {
            return new FitCurve([new PlotPoint(from, intercept + (slope * from)), new PlotPoint(to, intercept + (slope * to))], FitEquation.Line(intercept, slope), Quadratic: false);
        }

        return null;
    }

    /// <summary>One label per distinct off-scale value (largest groups first), placed at the group's drawn spot.</summary>
    private static OffScaleLabel[] Labels(List<OffScalePoint> points, string xName, string yName)
    {
        return [.. points
            .GroupBy(p => Text(p, xName, yName))
            .OrderByDescending(g => g.Count())
            .ThenBy(g => g.Key, StringComparer.Ordinal)
            .Take(MaxLabels)
            .Select(g => new OffScaleLabel(
                new PlotPoint(g.Average(p => p.Drawn.X), g.Average(p => p.Drawn.Y)),
                g.Count() == 1 ? g.Key : $"{g.Key} ({Figures.Count(g.Count())} points)",
                g.First().Side))];
    }

    /// <summary>The values that put a point off the scale: "weighed_kg = 99999".</summary>
    internal static string Text(OffScalePoint p, string xName, string yName)
    {
        var parts = new List<string>(2);
        if ((p.Side & (OffScaleSide.Left | OffScaleSide.Right)) != 0)
        {
            parts.Add($"{xName} = {Figures.Coefficient(p.X, 6)}");
        }

        if ((p.Side & (OffScaleSide.Above | OffScaleSide.Below)) != 0)
        {
            parts.Add($"{yName} = {Figures.Coefficient(p.Y, 6)}");
        }

        return string.Join(", ", parts);
    }
}
