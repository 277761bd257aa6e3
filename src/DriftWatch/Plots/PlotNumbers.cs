using System.Globalization;

namespace DriftWatch.Plots;

/// <summary>
/// Numbers as the pictures print them: a few significant digits, a true minus sign (U+2212), no exponent for
/// everyday magnitudes and "×10ⁿ" for the rest. The one formatter the plots, their captions and their
/// equations share.
/// </summary>
internal static class PlotNumbers
{
    public const int Digits = 4;
    public const char Minus = '\u2212';

    /// <summary>Below this magnitude (other than zero) or at or above <see cref="LargeFrom"/>, scientific form.</summary>
    private const double SmallBelow = 1e-4;
    private const double LargeFrom = 1e7;

    /// <summary>"8613", "−34.48", "0.0001234", "1.5×10⁸".</summary>
    public static string Sig(double value, int digits = Digits)
    {
        if (double.IsNaN(value))
        {
            return "undefined";
        }

        if (double.IsInfinity(value))
        {
            return value > 0 ? "∞" : Minus + "∞";
        }

        double rounded = Round(value, digits);
        string sign = rounded < 0 ? Minus.ToString() : string.Empty;
        double magnitude = Math.Abs(rounded);
        if (magnitude == 0)
        {
            return "0";
        }

        if (magnitude < SmallBelow || magnitude >= LargeFrom)
        {
            int exponent = (int)Math.Floor(Math.Log10(magnitude));
            double mantissa = Round(magnitude / Math.Pow(10, exponent), digits);
            if (mantissa >= 10)
            {
                mantissa /= 10;
                exponent++;
            }

            return sign + Plain(mantissa) + "×10" + Superscript(exponent);
        }

        return sign + Plain(magnitude);
    }

    /// <summary>Thousands separated by a thin space would confuse copy-paste; counts get "N0" grouping.</summary>
    public static string Count(long value) => value.ToString("N0", CultureInfo.InvariantCulture);

    /// <summary>A share as a percentage with up to two decimals: "1.25%".</summary>
    public static string Percent(double share) =>
        (share * 100).ToString("0.##", CultureInfo.InvariantCulture).Replace('-', Minus) + "%";

    /// <summary>The value rounded to <paramref name="digits"/> significant digits.</summary>
    public static double Round(double value, int digits)
    {
        if (value == 0 || !double.IsFinite(value))
        {
            return value;
        }

        double scale = Math.Pow(10, digits - 1 - (int)Math.Floor(Math.Log10(Math.Abs(value))));
        return Math.Round(value * scale, MidpointRounding.AwayFromZero) / scale;
    }

    private static string Plain(double magnitude)
    {
        // "R" of the rounded value: no trailing zeros, no exponent in the range this is used for.
        string text = magnitude.ToString("0.###############", CultureInfo.InvariantCulture);
        return text;
    }

    private static string Superscript(int exponent)
    {
        const string digits = "⁰¹²³⁴⁵⁶⁷⁸⁹";
        var text = Math.Abs(exponent).ToString(CultureInfo.InvariantCulture);
        var chars = text.Select(c => digits[c - '0']);
        return (exponent < 0 ? "⁻" : string.Empty) + string.Concat(chars);
    }
}
