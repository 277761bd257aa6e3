using DriftWatch.Core.Discovery;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Discovery;

public sealed class TableDiscoveryTests
{
    // 1 lb = 0.45359237 kg exactly (NIST SP 811, appendix B); 2.20462262185 is its inverse to 12 significant digits.
    private const double PoundsPerKilogram = 2.20462262185;

    [Fact]
    public void Assess_PlantedDerivations_AreFlaggedWithTheirEquationsAndNotOfferedAsCandidates()
    {
        // NIST StRD Norris: x and y are a real, nearly straight relationship (r from its certified R²).
        var norris = ReferenceData.Norris();
        double[] kg = norris.X, y = norris.Y;
        double[] lb = [.. kg.Select(v => v * PoundsPerKilogram)];
        double[] net = [.. norris.Y.Select((v, i) => v + (i % 5))];
        double[] total = [.. net.Select(v => v + 4.5)];
        var result = Assess(["kg", "y", "lb", "net", "total"], [kg, y, lb, net, total], 0.5);

        Assert.Equal(2, result.Derivations.Count);
        var pounds = Assert.Single(result.Derivations, d => d.Column == "lb");
        Assert.Equal("kg", pounds.From);
        Assert.Equal(DerivationKind.Affine, pounds.Kind);
        Assert.Equal(PoundsPerKilogram, pounds.Slope!.Value, 9);
        Assert.StartsWith("lb = 2.2046226", pounds.Equation, StringComparison.Ordinal);
        Assert.EndsWith("·kg", pounds.Equation, StringComparison.Ordinal);

        var sum = Assert.Single(result.Derivations, d => d.Column == "total");
        Assert.Equal("net", sum.From);
        Assert.Equal("total = net + 4.5", sum.Equation);

        Assert.DoesNotContain(result.Candidates, c => c.X is "lb" or "total" || c.Y is "lb" or "total");
        var line = Assert.Single(result.Candidates, c => c.X == "kg" && c.Y == "y");
        // Pearson's r of Norris against MathNet.Numerics; a straight line by the Core's own rules.
        Assert.Equal(MathNet.Numerics.Statistics.Correlation.Pearson(kg, y), line.R, 12);
        Assert.Equal(Shape.Linear, line.Shape);
        Assert.Equal(kg.Length, line.N);
    }

    [Fact]
    public void Assess_CopiedColumn_IsACopyOfTheFirstInCatalogueOrder()
    {
        var anscombe = ReferenceData.Anscombe(1);
        var result = Assess(["x", "y", "x_again"], [anscombe.X, anscombe.Y, [.. anscombe.X]], 0.5);

        var copy = Assert.Single(result.Derivations);
        Assert.Equal(("x_again", "x", DerivationKind.Copy, "x_again = x"), (copy.Column, copy.From, copy.Kind, copy.Equation));
    }

    [Fact]
    public void Assess_MonotoneButCurvedFunction_IsFlaggedWithoutALinearEquation()
    {
        // y = x³ on Norris's x: |ρ| = 1, |r| < 1 (a monotone transform keeps ranks; common practice).
        var x = ReferenceData.Norris().X;
        var result = Assess(["x", "cube"], [x, [.. x.Select(v => v * v * v)]], 0.5);

        var derivation = Assert.Single(result.Derivations);
        Assert.Equal(DerivationKind.Monotone, derivation.Kind);
        Assert.Null(derivation.Slope);
        Assert.Empty(result.Candidates);
    }

    [Fact]
    public void Assess_BelowTheBound_OffersNothing()
    {
        // Anscombe's four sets share r = 0.816 (Anscombe 1973): a bound of 0.9 leaves them out, 0.8 keeps them.
        var one = ReferenceData.Anscombe(1);
        Assert.Empty(Assess(["x", "y"], [one.X, one.Y], 0.9).Candidates);
        Assert.Equal(0.816, Assert.Single(Assess(["x", "y"], [one.X, one.Y], 0.8).Candidates).R, 3);
    }

    private static DiscoveryResult Assess(string[] names, double[][] columns, double minR)
    {
        double?[][] values = [.. columns.Select(c => c.Select(v => (double?)v).ToArray())];
        var plan = new SumPlan(SumsInProcess.Stats(names, values));
        var matrix = plan.Assemble(SumsInProcess.Values(plan, values));
        return TableDiscovery.Assess(matrix, new SharedSample(names, values, "all"), minR, Thresholds.Default);
    }
}
