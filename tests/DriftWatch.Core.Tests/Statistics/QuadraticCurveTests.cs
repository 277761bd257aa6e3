using DriftWatch.Core.Statistics;
using MathNet.Numerics;

namespace DriftWatch.Core.Tests.Statistics;

/// <summary>The drawn parabola against MathNet.Numerics' least-squares polynomial fit (the oracle).</summary>
public sealed class QuadraticCurveTests
{
    [Fact]
    public void Fit_AnscombeSetII_MatchesMathNetsPolynomialFit()
    {
        // Anscombe (1973) set II, a parabola in x (published table via ReferenceData).
        var set = ReferenceData.Anscombe(2);

        var curve = QuadraticCurve.Fit(set.X, set.Y)!;
        var reference = Fit.Polynomial(set.X, set.Y, 2);

        Assert.Equal(reference[0], curve.A, 9);
        Assert.Equal(reference[1], curve.B, 9);
        Assert.Equal(reference[2], curve.C, 9);
        foreach (var x in new[] { 4.0, 7.5, 14.0 })
        {
            Assert.Equal(Polynomial.Evaluate(x, reference), curve.Evaluate(x), 9);
        }
    }

    [Fact]
    public void Fit_XFarFromZero_StillMatchesTheFitOnShiftedX()
    {
        // The same parabola with x moved by 10⁶: evaluated in standardised x it keeps its digits. Oracle: MathNet's
        // fit on the unshifted x, which is well conditioned.
        var set = ReferenceData.Anscombe(2);
        var reference = Fit.Polynomial(set.X, set.Y, 2);

        var curve = QuadraticCurve.Fit([.. set.X.Select(x => x + 1e6)], set.Y)!;

        foreach (var x in set.X)
        {
            Assert.Equal(Polynomial.Evaluate(x, reference), curve.Evaluate(x + 1e6), 8);
        }
    }

    [Fact]
    public void Fit_FewerThanThreeDistinctX_IsUndefined()
    {
        Assert.Null(QuadraticCurve.Fit([1, 1, 2, 2], [3, 4, 5, 6]));
    }
}
