using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.Tests.Profiling;

public sealed class EquationTextTests
{
    [Theory]
    [InlineData(0.45359237000000004, 0.0, 1e-12, "y = 0.45359237·x")]
    [InlineData(3.5999999999999996, 1e-14, 1e-12, "y = 3.6·x")]
    [InlineData(1000, 0, 0, "y = 1000·x")]
    [InlineData(1.0000000000000002, 0, 1e-12, "y = x")]
    [InlineData(-1, 5, 1e-12, "y = -x + 5")]
    [InlineData(1.8, 31.999999999999996, 1e-9, "y = 1.8·x + 32")]
    [InlineData(2.5, -0.1250000000000001, 1e-12, "y = 2.5·x - 0.125")]
    public void Affine_FittedCoefficients_ReadAsTheirShortestEqualNumber(double slope, double intercept, double zero, string expected)
    {
        Assert.Equal(expected, EquationText.Affine(slope, intercept, zero));
    }
}
