using DriftWatch.Output;
using DriftWatch.Plots;

namespace DriftWatch.Tests.Plots;

/// <summary>
/// Equations as printed under the pictures. Conventions checked: the minus sign is U+2212 (ISO 80000-2, common
/// practice in typesetting), a negative coefficient joins the operator ("− 34.48·x", never "+ -34.48·x"), four
/// significant digits.
/// </summary>
public sealed class FitEquationTests
{
    [Fact]
    public void Line_NegativeSlope_JoinsTheSignIntoTheOperator()
    {
        Assert.Equal("y = 8613 \u2212 34.48\u00B7x", FitEquation.Line(8613, -34.48));
    }

    [Fact]
    public void Line_RoundsToFourSignificantDigits()
    {
        Assert.Equal("y = 8613 \u2212 34.48\u00B7x", FitEquation.Line(8613.456, -34.4849));
        Assert.Equal("y = 1.62 + 0.3114\u00B7x", FitEquation.Line(1.6203, 0.311437));
    }

    [Fact]
    public void Line_NegativeIntercept_UnitSlope_AndZeroTerms()
    {
        Assert.Equal("y = \u22122.5 + x", FitEquation.Line(-2.5, 1));
        Assert.Equal("y = 2\u00B7x", FitEquation.Line(0, 2));
        Assert.Equal("y = \u2212x", FitEquation.Line(0, -1));
        Assert.Equal("y = 7", FitEquation.Line(7, 0));
        Assert.Equal("y = 0", FitEquation.Line(0, 0));
    }

    [Fact]
    public void Line_FarMagnitudes_UseScientificForm()
    {
        Assert.Equal("y = 1.5\u00D710\u2078 + 2\u00D710\u207B\u2076\u00B7x", FitEquation.Line(1.5e8, 2e-6));
    }

    [Fact]
    public void Quadratic_AnscombeSetII_ReadsAsPublished()
    {
        // Anscombe (1973) set II is a parabola; its least-squares quadratic is about y = −5.9957 + 2.7808x − 0.1267x²
        // (from memory; QuadraticCurveTests check the fit itself against MathNet).
        Assert.Equal("y = \u22125.996 + 2.781\u00B7x \u2212 0.1267\u00B7x\u00B2", FitEquation.Quadratic(-5.9957343, 2.7808392, -0.1267133));
    }

    [Fact]
    public void Sig_NegativeNumbers_UseTheMinusSign_AndNoExponentForEverydayMagnitudes()
    {
        Assert.Equal("\u22120.0123", Figures.Coefficient(-0.012345, 3));
        Assert.Equal("99999", Figures.Coefficient(99999, 6));
        Assert.Equal("1.235\u00D710\u2077", Figures.Coefficient(12_345_678));
    }
}
