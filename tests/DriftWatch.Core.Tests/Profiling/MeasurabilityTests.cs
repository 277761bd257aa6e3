using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Profiling;

/// <summary>
/// When a check cannot measure a relationship. Common practice: Pearson's r is undefined when either column
/// has zero variance (its formula divides by both standard deviations), a least-squares slope is undefined
/// when x is constant, and a correlation test needs n − 2 ≥ 1 degrees of freedom.
/// </summary>
public sealed class MeasurabilityTests
{
    private static string? Assess(PairedSample sample, SourceFigures? figures = null, Thresholds? thresholds = null) =>
        Measurability.Assess(Profiler.Profile(sample, thresholds ?? Thresholds.Default), figures, thresholds ?? Thresholds.Default, "weight_kg", "price_eur");

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(4)]
    public void Assess_AnscombeSets_Measurable(int set)
    {
        // Anscombe (1973): all four sets have 11 rows and r = 0.816; set 4's x is 8 in ten rows and 19 in one,
        // so it is not constant (its r is carried by that one row, which the leverage finding reports).
        Assert.Null(Assess(ReferenceData.Anscombe(set)));
    }

    [Fact]
    public void Assess_NorrisCalibration_Measurable()
    {
        // NIST StRD Norris: 36 rows, a defined line (slope 1.00211681802045).
        Assert.Null(Assess(ReferenceData.Norris()));
    }

    [Fact]
    public void Assess_EmptyWindow_SaysNoRows()
    {
        var reason = Assess(PairedSample.Empty);

        Assert.Equal("No rows in the window: there is nothing to measure of price_eur against weight_kg.", reason);
    }

    [Fact]
    public void Assess_ExactFiguresSayZeroRows_SaysNoRows()
    {
        // The database's own count(*) over the window is 0 (the push-down figures); the sample is empty too.
        var figures = new SourceFigures(0, 0, 0, null, null, null, null, null, null, null);

        Assert.StartsWith("No rows in the window", Assess(PairedSample.Empty, figures), StringComparison.Ordinal);
    }

    [Fact]
    public void Assess_AllNull_SaysHowManyNull()
    {
        // Anscombe set 1's x with every y missing: 11 rows, none usable.
        var anscombe = ReferenceData.Anscombe(1);
        var sample = PairedSample.FromRows(anscombe.X.Select(x => ((double?)x, (double?)null)));

        var reason = Assess(sample);

        Assert.Equal("11 rows in the window but none usable: 11 with weight_kg or price_eur null.", reason);
    }

    [Fact]
    public void Assess_NullAndNonFinite_NamesBoth()
    {
        var sample = PairedSample.FromRows([(1.0, null), (null, 2.0), (double.NaN, 3.0), (4.0, double.PositiveInfinity)]);

        var reason = Assess(sample);

        Assert.Equal("4 rows in the window but none usable: 2 with weight_kg or price_eur null, 2 not finite.", reason);
    }

    [Fact]
    public void Assess_ExactFigures_CountsComeFromTheWindow()
    {
        // A sample of 3 all-null rows from a window the database counted as 5,000 rows, all null.
        var sample = PairedSample.FromRows([(null, 1.0), (null, 2.0), (null, 3.0)]);
        var figures = new SourceFigures(5000, 0, 5000, null, null, null, null, null, null, null);

        Assert.Equal("5,000 rows in the window but none usable: 5,000 with weight_kg or price_eur null.", Assess(sample, figures));
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    public void Assess_OneOrTwoRows_TooFew(int n)
    {
        // The first n rows of Anscombe set 1: n − 2 ≤ 0 degrees of freedom, r is ±1 or undefined by construction.
        var a = ReferenceData.Anscombe(1);
        var sample = new PairedSample(a.X[..n], a.Y[..n]);

        var reason = Assess(sample);

        Assert.Equal(
            $"Only {n} usable {(n == 1 ? "row" : "rows")} of weight_kg and price_eur (of {n} {(n == 1 ? "row" : "rows")} in the window); " +
            "measuring a relationship needs at least 10 (min_usable_rows).",
            reason);
    }

    [Fact]
    public void Assess_BelowMinUsableRows_TooFewButAtTheMinimumMeasurable()
    {
        // Anscombe set 1 has 11 rows: measurable at the default 10, too few when the pair asks for 12.
        var a = ReferenceData.Anscombe(1);

        Assert.Null(Assess(a, thresholds: Thresholds.Default with { MinUsableRows = 11 }));
        Assert.StartsWith("Only 11 usable rows", Assess(a, thresholds: Thresholds.Default with { MinUsableRows = 12 }), StringComparison.Ordinal);
    }

    [Fact]
    public void Assess_ConstantX_SaysTheValue()
    {
        // Anscombe set 4 without its one x = 19 row: x is 8 in all ten remaining rows (zero variance).
        var a = ReferenceData.Anscombe(4);
        var keep = Enumerable.Range(0, a.X.Length).Where(i => a.X[i] != 19).ToArray();
        var sample = new PairedSample([.. keep.Select(i => a.X[i])], [.. keep.Select(i => a.Y[i])]);
        Assert.Equal(10, sample.UsedCount);

        var reason = Assess(sample);

        Assert.Equal("weight_kg is constant (8) in all 10 usable rows: the correlation of price_eur with weight_kg is undefined.", reason);
    }

    [Fact]
    public void Assess_ConstantY_SaysTheValue()
    {
        // Anscombe set 1's x against a y stuck at 0 (a column that was never filled in).
        var a = ReferenceData.Anscombe(1);
        var sample = new PairedSample(a.X, [.. a.X.Select(_ => 0.0)]);

        var reason = Assess(sample);

        Assert.Equal("price_eur is constant (0) in all 11 usable rows: the correlation of price_eur with weight_kg is undefined.", reason);
    }

    [Fact]
    public void Assess_BothConstant_NamesBoth()
    {
        var sample = new PairedSample([.. Enumerable.Repeat(2.5, 12)], [.. Enumerable.Repeat(-1.0, 12)]);

        Assert.Equal(
            "weight_kg and price_eur are both constant (2.5 and -1) in all 12 usable rows: correlation and slope are undefined.",
            Assess(sample));
    }
}
