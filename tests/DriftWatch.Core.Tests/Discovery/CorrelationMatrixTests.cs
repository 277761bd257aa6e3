using DriftWatch.Core.Discovery;
using MathNet.Numerics.Statistics;

namespace DriftWatch.Core.Tests.Discovery;

public sealed class CorrelationMatrixTests
{
    [Fact]
    public void Assemble_NorrisColumns_MatchesMathNetPearson()
    {
        // NIST StRD Norris (certified r follows from its certified R² = 0.999993745883712); MathNet.Numerics is the oracle.
        var norris = ReferenceData.Norris();
        double?[][] columns = [[.. norris.X.Select(v => (double?)v)], [.. norris.Y.Select(v => (double?)v)], [.. norris.X.Select((v, i) => (double?)(v * v + i))]];
        var matrix = Matrix(["x", "y", "z"], columns);

        Assert.Equal(Correlation.Pearson(norris.X, norris.Y), matrix.R(0, 1)!.Value, 12);
        Assert.Equal(Math.Sqrt(0.999993745883712), matrix.R(0, 1)!.Value, 12);
        Assert.Equal(Correlation.Pearson(norris.Y, columns[2].Select(v => v!.Value)), matrix.R(1, 2)!.Value, 12);
        Assert.Equal(matrix.R(0, 1), matrix.R(1, 0));
        Assert.Equal(norris.X.Length, matrix.N(0, 2));
    }

    [Fact]
    public void Assemble_NullsAndNonFiniteValues_UsesPairwiseCompleteRowsAsMathNetOnThoseRows()
    {
        // Anscombe's first and third sets (Anscombe 1973) with holes punched: r must be that of the rows both have.
        var one = ReferenceData.Anscombe(1);
        var three = ReferenceData.Anscombe(3);
        double?[] x = [.. one.X.Select((v, i) => i == 2 ? null : (double?)v)];
        double?[] y = [.. one.Y.Select((v, i) => i == 5 ? double.NaN : (double?)v)];
        double?[] z = [.. three.Y.Select((v, i) => i == 7 ? double.PositiveInfinity : (double?)v)];
        var matrix = Matrix(["x", "y", "z"], [x, y, z]);

        foreach (var (i, j, a, b) in new[] { (0, 1, x, y), (0, 2, x, z), (1, 2, y, z) })
        {
            var rows = Enumerable.Range(0, a.Length).Where(k => a[k] is { } p && double.IsFinite(p) && b[k] is { } q && double.IsFinite(q)).ToList();
            Assert.Equal(Correlation.Pearson(rows.Select(k => a[k]!.Value), rows.Select(k => b[k]!.Value)), matrix.R(i, j)!.Value, 12);
            Assert.Equal(rows.Count, matrix.N(i, j));
        }
    }

    [Fact]
    public void Assemble_LargeOffsetSmallSpread_KeepsTheDigits()
    {
        // The NIST StRD NumAcc4 pattern (1000000000.2, .1, .3: a spread of 0.1 on 1e9): raw sums of squares lose every digit there.
        double[] x = ReferenceData.NumAcc(1000000000.2, 1000000000.1, 1000000000.3);
        double[] y = [.. x.Select((v, i) => (v * 3) + (i % 3 == 0 ? 0.05 : 0))];
        var matrix = Matrix(["x", "y"], [[.. x.Select(v => (double?)v)], [.. y.Select(v => (double?)v)]]);

        Assert.Equal(Correlation.Pearson(x, y), matrix.R(0, 1)!.Value, 6);
    }

    [Fact]
    public void Assemble_ConstantColumn_LeavesItsCorrelationsUndefined()
    {
        var matrix = Matrix(["x", "c"], [[1.0, 2, 3, 4], [5.0, 5, 5, 5]]);
        Assert.Null(matrix.R(0, 1));
    }

    [Fact]
    public void Plan_CompleteColumns_NeedOnlyCrossProductsPerPair()
    {
        var stats = SumsInProcess.Stats(["a", "b", "c"], [[1.0, 2, 3], [2.0, 1, 3], [null, 1, 2]]);
        var plan = new SumPlan(stats);
        // a and b complete: Σ and Σ² each, one cross product; every pair with c: its own count, sums and sums of squares.
        Assert.Equal(4 + 1 + (2 * 6), plan.Terms.Count);
    }

    private static CorrelationMatrix Matrix(string[] names, double?[][] columns)
    {
        var plan = new SumPlan(SumsInProcess.Stats(names, columns));
        return plan.Assemble(SumsInProcess.Values(plan, columns));
    }
}
