using DriftWatch.Output;

namespace DriftWatch.Tests.Output;

/// <summary>
/// The one formatter for figures shown to people (CLI, dashboard, digest, plots). The rules are our own
/// presentation rules; the arithmetic they rest on is common practice: rounding half away from zero as people
/// round by hand, invariant-culture digit grouping with commas, the minus sign U+2212 in typeset equations
/// (ISO 80000-2).
/// </summary>
public sealed class FiguresTests
{
    // Four significant digits with thousands separators (values from Anscombe's quartet, 1973: mean of y
    // 7.500909, r 0.816420516, slope 0.5000909, intercept 3.0000909; the rest chosen to hit each branch).
    [Theory]
    [InlineData(0.816420516, "0.8164")]
    [InlineData(3.0000909, "3.000")]
    [InlineData(0.5000909, "0.5001")]
    [InlineData(7.500909, "7.501")]
    [InlineData(118.0, "118.0")]
    [InlineData(-1234.5, "-1,235")]
    [InlineData(12345.678, "12,346")]
    [InlineData(0.0012345, "0.001235")]
    [InlineData(0.000012345, "1.235e-05")]
    [InlineData(2.5e15, "2.500e+15")]
    [InlineData(0.0, "0")]
    [InlineData(0.999999, "1.000")]
    [InlineData(9.99996, "10.00")]
    public void Number_Value_FourSignificantDigits(double value, string expected) =>
        Assert.Equal(expected, Figures.Number(value));

    [Theory]
    [InlineData(double.NaN)]
    [InlineData(double.PositiveInfinity)]
    [InlineData(double.NegativeInfinity)]
    public void Number_NonFinite_ShownMissing(double value) => Assert.Equal("—", Figures.Number(value));

    [Fact]
    public void Number_Null_ShownMissing() => Assert.Equal("—", Figures.Number(null));

    // Pictures and equations: no trailing zeros, U+2212 minus, "×10ⁿ" outside 1e-4 .. 1e7.
    [Theory]
    [InlineData(8613.456, 4, "8613")]
    [InlineData(-34.4849, 4, "\u221234.48")]
    [InlineData(-0.012345, 3, "\u22120.0123")]
    [InlineData(99999, 6, "99999")]
    [InlineData(0.0001234, 4, "0.0001234")]
    [InlineData(12_345_678, 4, "1.235\u00D710\u2077")]
    [InlineData(-2e-6, 4, "\u22122\u00D710\u207B\u2076")]
    [InlineData(9.99996e7, 4, "1\u00D710\u2078")]
    [InlineData(0, 4, "0")]
    public void Coefficient_Value_SignificantDigitsAndTrueMinus(double value, int digits, string expected) =>
        Assert.Equal(expected, Figures.Coefficient(value, digits));

    [Fact]
    public void Coefficient_NonFinite_SaidInWords()
    {
        Assert.Equal("undefined", Figures.Coefficient(double.NaN));
        Assert.Equal("∞", Figures.Coefficient(double.PositiveInfinity));
        Assert.Equal("\u2212∞", Figures.Coefficient(double.NegativeInfinity));
    }

    [Fact]
    public void RoundSignificant_HalfAwayFromZero()
    {
        // 0.125 and 2.5 are exact in binary, so the half is a true half.
        Assert.Equal(0.13, Figures.RoundSignificant(0.125, 2), 10);
        Assert.Equal(-3.0, Figures.RoundSignificant(-2.5, 1), 10);
        Assert.Equal(-0.0123, Figures.RoundSignificant(-0.012345, 3), 10);
    }

    [Fact]
    public void Count_ThousandsSeparators()
    {
        Assert.Equal("1,234,567", Figures.Count(1_234_567));
        Assert.Equal("-12,000", Figures.Count(-12_000));
        Assert.Equal("—", Figures.Count(null));
    }

    [Fact]
    public void Correlation_ThreeDecimals_AndSignedMoves()
    {
        Assert.Equal("0.816", Figures.Correlation(0.816420516));
        Assert.Equal("-0.340", Figures.Correlation(-0.34));
        Assert.Equal("—", Figures.Correlation(double.NaN));
        Assert.Equal("+0.012", Figures.SignedCorrelation(0.0123));
        Assert.Equal("-0.340", Figures.SignedCorrelation(-0.34));
        Assert.Equal("0.000", Figures.SignedCorrelation(0));
    }

    [Theory]
    [InlineData(2.3e-7, "< 0.001")]
    [InlineData(0.0004, "< 0.001")]
    [InlineData(0.0123456, "0.012")]
    [InlineData(0.05, "0.050")]
    [InlineData(1.0, "1.000")]
    public void PValue_ThreeDecimals_TinyOnesBounded(double p, string expected) => Assert.Equal(expected, Figures.PValue(p));

    [Fact]
    public void PValue_Undefined_ShownMissing() => Assert.Equal("—", Figures.PValue(double.NaN));

    [Theory]
    [InlineData(1.0 / 11, "9.09%")]
    [InlineData(0.95, "95%")]
    [InlineData(0.0125, "1.25%")]
    [InlineData(0.0, "0%")]
    public void Percent_Share_UpToTwoDecimals(double share, string expected) =>
        Assert.Equal(expected, Figures.Percent(share));

    [Fact]
    public void Percent_Undefined_ShownMissing() => Assert.Equal("—", Figures.Percent(null));

    [Fact]
    public void Time_AlwaysUtc() =>
        Assert.Equal("2026-12-02 14:05 UTC", Figures.Time(new DateTimeOffset(2026, 12, 2, 15, 5, 9, TimeSpan.FromHours(1))));
}
