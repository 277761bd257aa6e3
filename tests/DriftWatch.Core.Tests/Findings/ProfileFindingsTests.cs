using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Findings;

public sealed class ProfileFindingsTests
{
    private static IReadOnlyList<Finding> For(PairedSample sample, PairDeclaration? declared = null) =>
        FindingEngine.ForProfile(Profiler.Profile(sample, Thresholds.Default), declared ?? PairDeclaration.None, Thresholds.Default, "amount_net", "amount_gross");

    [Fact]
    public void ForProfile_OrdinaryNoisyLine_RaisesNothing()
    {
        Assert.Empty(For(Scenarios.Sample(Scenarios.Draw(seed: 21))));
    }

    [Fact]
    public void ForProfile_AnscombeSetOne_RaisesNothing()
    {
        // Anscombe (1973) set 1: the well-behaved linear cloud.
        Assert.Empty(For(ReferenceData.Anscombe(1)));
    }

    [Fact]
    public void ForProfile_ExactAffineUndeclared_IsPerfectRelationshipWarningWithEquation()
    {
        // NIST SP 811: 1 kWh = 3.6 MJ; a column derived by that factor is not an independent measurement.
        var x = Generated.Uniform(new Random(22), 200, 1, 500);
        var findings = For(new PairedSample(x, [.. x.Select(v => v * 3.6)]));

        var f = Assert.Single(findings);
        Assert.Equal(FindingKind.PerfectRelationship, f.Kind);
        Assert.Equal(Severity.Warning, f.Severity);
        Assert.Contains("amount_gross = 3.6·amount_net", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ForProfile_ExactAffineDeclaredExact_RaisesNothing()
    {
        var x = Generated.Uniform(new Random(22), 200, 1, 500);
        Assert.Empty(For(new PairedSample(x, [.. x.Select(v => v * 3.6)]), new PairDeclaration(Exact: true)));
    }

    [Fact]
    public void ForProfile_ExactMonotoneUndeclared_IsPerfectRelationship()
    {
        var x = Generated.Uniform(new Random(23), 200, 0, 4);
        var f = Assert.Single(For(new PairedSample(x, [.. x.Select(Math.Exp)])));

        Assert.Equal(FindingKind.PerfectRelationship, f.Kind);
        Assert.Contains("monotone", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ForProfile_DeclaredExactWithFiveBrokenRows_IsExactnessLostCritical()
    {
        var x = Generated.Uniform(new Random(24), 1000, 1, 500);
        var y = x.Select(v => v * 3.6).ToArray();
        for (int i = 0; i < 5; i++)
        {
            y[i * 100] = x[i * 100];
        }

        var findings = For(new PairedSample(x, y), new PairDeclaration(Exact: true));

        var f = Assert.Single(findings, g => g.Kind == FindingKind.ExactnessLost);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.Contains("no longer an exact function", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ForProfile_AnscombeSetTwo_IsCurvature()
    {
        // Anscombe (1973) set 2: a smooth curve.
        var f = Assert.Single(For(ReferenceData.Anscombe(2)));

        Assert.Equal(FindingKind.Curvature, f.Kind);
        Assert.True(f.PValue < 0.01);
    }

    [Fact]
    public void ForProfile_AnscombeSetThree_IsOutliers()
    {
        // Anscombe (1973) set 3: one point far off an otherwise exact line.
        var f = Assert.Single(For(ReferenceData.Anscombe(3)));

        Assert.Equal(FindingKind.Outliers, f.Kind);
        Assert.Equal(1.0 / 11, f.Effect!.Value, 12);
        Assert.StartsWith("1 of 11 rows", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ForProfile_AnscombeSetFour_IsSinglePointLeverage()
    {
        // Anscombe (1973) set 4: one point alone sets the slope.
        var f = Assert.Single(For(ReferenceData.Anscombe(4)));

        Assert.Equal(FindingKind.SinglePointLeverage, f.Kind);
        Assert.Contains("r is undefined", f.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ForProfile_NegativeRelationshipDeclaredPositive_IsSignFlip()
    {
        var sample = Scenarios.Sample(Scenarios.Draw(seed: 25, slope: -2, intercept: 210));

        var f = Assert.Single(For(sample, new PairDeclaration(DeclaredDirection.Positive)));

        Assert.Equal(FindingKind.SignFlip, f.Kind);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.Contains("declared positive", f.Message, StringComparison.Ordinal);
        Assert.Empty(For(sample, new PairDeclaration(DeclaredDirection.Negative)));
    }

    [Fact]
    public void ForProfile_UndefinedProfile_RaisesNothing()
    {
        Assert.Empty(For(new PairedSample([1, 1, 1], [1, 2, 3])));
    }
}
