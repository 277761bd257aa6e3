using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.Plots;
using MathNet.Numerics;

namespace DriftWatch.Tests.Plots;

public sealed class ScatterPlotModelBuilderTests
{
    private const double Sentinel = 99999;

    /// <summary>Anscombe (1973) set I (published table) plus three rows whose y is a 99999 placeholder.</summary>
    private static PairedSample WithSentinels() =>
        new([.. AnscombeData.X, 5, 9, 12], [.. AnscombeData.Y1, Sentinel, Sentinel, Sentinel]);

    private static ScatterPlotModel Build(PairedSample current, RelationshipProfile? profile = null) =>
        ScatterPlotModelBuilder.Build(
            new ScatterPlotInput("declared_kg", "weighed_kg", null, null, current, profile ?? Profiler.Profile(current, Thresholds.Default)),
            Thresholds.Default);

    [Fact]
    public void Build_PlaceholderValues_LimitsComeFromTheQuartiles_AndKeepEveryRealValue()
    {
        var model = Build(WithSentinels());

        // Tukey's far-out fences (quartiles ∓ 3 IQR, common practice) leave 99999 out; every published y stays in.
        Assert.All(AnscombeData.Y1, y => Assert.True(model.Y.Contains(y), $"{y} is off the drawn range {model.Y}"));
        Assert.True(model.Y.Max < 20, $"the y axis reaches {model.Y.Max}: the placeholders flattened the bulk");
        // The bulk is Anscombe I's own range, 4.26 to 10.84, with at most the padding beyond it.
        Assert.InRange(model.Y.Min, 4.26 - (0.1 * (10.84 - 4.26)), 4.26);
        Assert.InRange(model.Y.Max, 10.84, 10.84 + (0.2 * (10.84 - 4.26)));
    }

    [Fact]
    public void Build_PlaceholderValues_AreListedOffScale_WithTheirValues_AndLabelled()
    {
        var model = Build(WithSentinels());

        Assert.Equal(3, model.OffScale.Count);
        Assert.All(model.OffScale, p =>
        {
            Assert.Equal(Sentinel, p.Y);
            Assert.Equal(OffScaleSide.Above, p.Side);
            Assert.True(model.Y.Contains(p.Drawn.Y) && p.Drawn.Y > 10.84, $"drawn at {p.Drawn.Y}, not at the top edge");
        });
        Assert.Equal([5.0, 9.0, 12.0], model.OffScale.Select(p => p.X).Order());
        var label = Assert.Single(model.Labels);
        Assert.Equal("weighed_kg = 99999 (3 points)", label.Text);
        Assert.Contains("3 points far outside the bulk are drawn as triangles at the edge", model.Caption, StringComparison.Ordinal);
        // The off-scale points are not drawn again among the ordinary ones.
        Assert.Equal(11, model.Series.Single().Ordinary.Count + model.Series.Single().Outlying.Count);
    }

    [Fact]
    public void Build_AnscombeSetIII_MarksItsOneOutlier()
    {
        // Anscombe (1973): set III lies on a line but for one point, (13, 12.74).
        var model = Build(AnscombeData.Set3);

        var series = model.Series.Single();
        var outlier = Assert.Single(series.Outlying);
        Assert.Equal((13, 12.74), (outlier.X, outlier.Y));
        Assert.Equal(10, series.Ordinary.Count);
        Assert.Empty(model.OffScale);
    }

    [Fact]
    public void Build_CurvedSample_DrawsTheParabola_WhosePointsMatchMathNetsPolynomialFit()
    {
        // Anscombe (1973) set II is a parabola in x; the profile finds the curvature, so the parabola is drawn.
        double[] y2 = [9.14, 8.14, 8.74, 8.77, 9.26, 8.10, 6.13, 3.10, 9.13, 7.26, 4.74];
        var sample = new PairedSample(AnscombeData.X, y2);
        Assert.True(Curvature.Found(Profiler.Profile(sample, Thresholds.Default), Thresholds.Default));

        var fit = Build(sample).Series.Single().Fit;

        Assert.NotNull(fit);
        Assert.True(fit.Quadratic);
        // Oracle: MathNet.Numerics' least-squares polynomial fit of degree 2 on the raw x.
        var reference = Fit.Polynomial(AnscombeData.X, y2, 2);
        Assert.True(fit.Points.Count > 20, "a parabola needs more than a few points to look curved");
        Assert.All(fit.Points, p => Assert.Equal(Polynomial.Evaluate(p.X, reference), p.Y, 1e-9));
        Assert.Equal(4, fit.Points.Min(p => p.X), 12);
        Assert.Equal(14, fit.Points.Max(p => p.X), 12);
        Assert.StartsWith("y = \u22125.996 + 2.781\u00B7x \u2212 0.1267\u00B7x\u00B2", fit.Equation, StringComparison.Ordinal);
    }

    [Fact]
    public void Build_StraightSample_DrawsTheProfilesLine()
    {
        var model = Build(AnscombeData.Set1, AnscombeData.Fit);

        var fit = model.Series.Single().Fit;
        Assert.NotNull(fit);
        Assert.False(fit.Quadratic);
        Assert.Equal("y = 3 + 0.5\u00B7x", fit.Equation);
        Assert.All(fit.Points, p => Assert.Equal(3 + (0.5 * p.X), p.Y, 12));
    }
}
