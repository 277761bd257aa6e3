using System.Globalization;

namespace DriftWatch.Output;

/// <summary>
/// The one formatter for figures shown to people: the CLI tables, the dashboard pages, the mail digest and the
/// plots all call it, so a figure reads the same wherever it appears. Invariant culture, so a report reads the
/// same on every machine; rounding half away from zero, as people round by hand. JSON is not formatted here:
/// it keeps numbers as numbers.
/// </summary>
internal static class Figures
{
    /// <summary>Shown for a figure that is undefined: null, NaN or infinite.</summary>
    public const string Missing = "—";

    /// <summary>The true minus sign the pictures and their equations use.</summary>
    public const char Minus = '\u2212';

    /// <summary>Significant digits of a figure in a table, a caption or an equation.</summary>
    public const int Digits = 4;

    /// <summary>
    /// A figure with four significant digits and thousands separators: 12,345 · 118.0 · 3.000 · 0.8164 ·
    /// 0.001235 · 1.235e-05; an exponent only below 1e-4 or from 1e15.
    /// </summary>
    public static string Number(double? value)
    {
        if (value is not { } v || !double.IsFinite(v))
        {
            return Missing;
        }

        if (v == 0)
        {
            return "0";
        }

        var magnitude = Math.Abs(v);
        if (magnitude < 1e-4 || magnitude >= 1e15)
        {
            return v.ToString("0.000e+00", CultureInfo.InvariantCulture);
        }

        // Digits before the decimal point (1 for 1.5, 0 for 0.5, -2 for 0.005).
        var exponent = (int)Math.Floor(Math.Log10(magnitude)) + 1;
        var decimals = Math.Max(0, Digits - exponent);
        var rounded = Math.Round(v, decimals, MidpointRounding.AwayFromZero);
        if (Math.Abs(rounded) >= Math.Pow(10, exponent) && decimals > 0)
        {
            // Rounding carried into a new digit (0.99999 -> 1.0000): one decimal fewer keeps four digits.
            decimals--;
            rounded = Math.Round(v, decimals, MidpointRounding.AwayFromZero);
        }

        return rounded.ToString("N" + decimals.ToString(CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
    }

    /// <summary>
    /// A figure as the pictures and equations print it: significant digits without trailing zeros, a true
    /// minus sign, no grouping, "×10ⁿ" below 1e-4 and from 1e7: "8613", "−34.48", "0.0001234", "1.5×10⁸".
    /// </summary>
    public static string Coefficient(double value, int digits = Digits)
    {
        if (double.IsNaN(value))
        {
            return "undefined";
        }

        if (double.IsInfinity(value))
        {
            return value > 0 ? "∞" : Minus + "∞";
        }

        double rounded = RoundSignificant(value, digits);
        string sign = rounded < 0 ? Minus.ToString() : string.Empty;
        double magnitude = Math.Abs(rounded);
        if (magnitude == 0)
        {
            return "0";
        }

        if (magnitude < 1e-4 || magnitude >= 1e7)
        {
            int exponent = (int)Math.Floor(Math.Log10(magnitude));
            double mantissa = RoundSignificant(magnitude / Math.Pow(10, exponent), digits);
            if (mantissa >= 10)
            {
                mantissa /= 10;
                exponent++;
            }

            return sign + Plain(mantissa) + "×10" + Superscript(exponent);
        }

        return sign + Plain(magnitude);
    }

    /// <summary>The value rounded to <paramref name="digits"/> significant digits.</summary>
    public static double RoundSignificant(double value, int digits)
    {
        if (value == 0 || !double.IsFinite(value))
        {
            return value;
        }

        double scale = Math.Pow(10, digits - 1 - (int)Math.Floor(Math.Log10(Math.Abs(value))));
        return Math.Round(value * scale, MidpointRounding.AwayFromZero) / scale;
    }

    /// <summary>A count with thousands separators: "1,234,567" (a thin space would confuse copy-paste).</summary>
    public static string Count(long? value) =>
        value is { } v ? v.ToString("N0", CultureInfo.InvariantCulture) : Missing;

    /// <summary>A correlation with three decimals, so a column of them lines up: "0.816", "-0.340".</summary>
    public static string Correlation(double? value) =>
        value is { } v && double.IsFinite(v) ? v.ToString("0.000", CultureInfo.InvariantCulture) : Missing;

    /// <summary>A change in r with its sign, so "+0.012" and "-0.340" read as moves.</summary>
    public static string SignedCorrelation(double? value) =>
        value is { } v && double.IsFinite(v) ? v.ToString("+0.000;-0.000;0.000", CultureInfo.InvariantCulture) : Missing;

    /// <summary>
    /// A p-value with three decimals, and "&lt; 0.001" below that: smaller ones are a bound, since their digits
    /// mean nothing to a reader (the usual reporting convention, e.g. the APA style guide).
    /// </summary>
    public static string PValue(double? value) =>
        value is not { } v || !double.IsFinite(v) ? Missing
        : v < 0.001 ? "< 0.001"
        : v.ToString("0.000", CultureInfo.InvariantCulture);

    /// <summary>A share (0.0125) as a percentage with up to two decimals: "1.25%", "95%".</summary>
    public static string Percent(double? share) =>
        share is { } s && double.IsFinite(s)
            ? (s * 100).ToString("0.##", CultureInfo.InvariantCulture) + "%"
            : Missing;

    /// <summary>A moment as people read it, always UTC: "2026-12-02 14:05 UTC".</summary>
    public static string Time(DateTimeOffset at) =>
        at.UtcDateTime.ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture) + " UTC";

    private static string Plain(double magnitude) =>
        // The rounded value without trailing zeros; no exponent in the range this is used for.
        magnitude.ToString("0.###############", CultureInfo.InvariantCulture);

    private static string Superscript(int exponent)
    {
        const string digits = "⁰¹²³⁴⁵⁶⁷⁸⁹";
        var text = Math.Abs(exponent).ToString(CultureInfo.InvariantCulture);
        var chars = text.Select(c => digits[c - '0']);
        return (exponent < 0 ? "⁻" : string.Empty) + string.Concat(chars);
    }
}
