using System.Globalization;

namespace DriftWatch.Core.Profiling;

/// <summary>How figures read in shape reasons and finding messages: few significant digits, invariant culture.</summary>
internal static class Numbers
{
    /// <summary>Below this a p-value is written as a bound: the normal and t tails are not exact there.</summary>
    private const double SmallestShownP = 1e-16;

    /// <summary><paramref name="value"/> to <paramref name="digits"/> significant digits, without exponent where sensible.</summary>
    public static string Sig(double value, int digits = 3)
    {
        if (!double.IsFinite(value))
        {
            return "undefined";
        }

        string g = value.ToString("G" + digits.ToString(CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
        double rounded = double.Parse(g, CultureInfo.InvariantCulture);
        double magnitude = Math.Abs(rounded);
        if (magnitude == 0 || (magnitude >= 1e-4 && magnitude < 1e15))
        {
            return rounded.ToString("R", CultureInfo.InvariantCulture);
        }

        return g;
    }

    public static string Sig(double? value, int digits = 3) => value is { } v ? Sig(v, digits) : "undefined";

    /// <summary>"p = 0.0031" or "p < 1e-16".</summary>
    public static string P(double? p) => p switch
    {
        null => "p undefined",
        < SmallestShownP => "p < 1e-16",
        { } v => "p = " + Sig(v, 2),
    };

    /// <summary>A rate as a percentage: "1.2%".</summary>
    public static string Percent(double rate) => Sig(rate * 100, 3) + "%";

    public static string Count(long n) => n.ToString("N0", CultureInfo.InvariantCulture);
}
