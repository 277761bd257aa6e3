using DriftWatch.Output;

namespace DriftWatch.Tests.Output;

public sealed class ReadableTests
{
    // Four significant digits, invariant culture, thousands separated by commas: the rule the tables
    // follow (our own presentation rule; rounding half away from zero, as people round by hand).
    [Theory]
    [InlineData(0.816420516, "0.8164")]
    [InlineData(3.0000909, "3.000")]
    [InlineData(0.5000909, "0.5001")]
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
        Assert.Equal(expected, Readable.Number(value));

    [Theory]
    [InlineData(double.NaN)]
    [InlineData(double.PositiveInfinity)]
    public void Number_NonFinite_ShownUndefined(double value) =>
        Assert.Equal("n/a", Readable.Number(value));

    [Fact]
    public void Number_Null_ShownUndefined() => Assert.Equal("n/a", Readable.Number(null));

    [Fact]
    public void Count_Large_ThousandsSeparators() => Assert.Equal("1,234,567", Readable.Count(1_234_567));

    [Theory]
    [InlineData(2.3e-7, "< 0.0001")]
    [InlineData(0.0123456, "0.01235")]
    public void Probability_Value_TinyOnesBounded(double p, string expected) =>
        Assert.Equal(expected, Readable.Probability(p));

    [Fact]
    public void Percent_Rate_TimesHundred() => Assert.Equal("9.091%", Readable.Percent(1.0 / 11));
}
