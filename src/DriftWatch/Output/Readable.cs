using System.Globalization;

namespace DriftWatch.Output;

/// <summary>
/// Numbers for people: four significant digits, thousands separators, "n/a" for an undefined figure.
/// Invariant culture, so a report reads the same on every machine. The JSON keeps full precision.
/// </summary>
internal static class Readable
{
    public const string Undefined = "n/a";

    private const int Significant = 4;

    public static string Count(long? value) =>
        value is { } v ? v.ToString("N0", CultureInfo.InvariantCulture) : Undefined;

    /// <summary>12,345 · 118.0 · 3.000 · 0.8164 · 0.001235 · 1.235e-05; never an exponent between 1e-4 and 1e15.</summary>
    public static string Number(double? value)
    {
        if (value is not { } v || !double.IsFinite(v))
        {
            return Undefined;
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
        var decimals = Math.Max(0, Significant - exponent);
        var rounded = Math.Round(v, decimals, MidpointRounding.AwayFromZero);
        if (Math.Abs(rounded) >= Math.Pow(10, exponent) && decimals > 0)
        {
            // Rounding carried into a new digit (0.99999 -> 1.0000): one decimal fewer keeps four digits.
            decimals--;
            rounded = Math.Round(v, decimals, MidpointRounding.AwayFromZero);
        }
        return rounded.ToString("N" + decimals.ToString(CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
    }

    /// <summary>p-values: tiny ones as a bound, since their digits mean nothing to a reader.</summary>
    public static string Probability(double? value) =>
        value is { } v && double.IsFinite(v) && v < 1e-4 ? "< 0.0001" : Number(value);

    public static string Percent(double? rate) =>
        rate is { } r && double.IsFinite(r) ? Number(r * 100) + "%" : Undefined;

    public static string YesNo(bool value) => value ? "yes" : "no";

    /// <summary>"9.000 ± 3.317".</summary>
    public static string WithSpread(double? centre, double? spread) =>
        spread is null ? Number(centre) : $"{Number(centre)} ± {Number(spread)}";

    /// <summary>"0.8164 [0.4244, 0.9507]".</summary>
    public static string WithInterval(double? value, double? low, double? high) =>
        low is null || high is null ? Number(value) : $"{Number(value)} [{Number(low)}, {Number(high)}]";

    /// <summary>"3 (9.091%)"; the note is left out when there is none.</summary>
    public static string WithNote(string value, string? note) => note is null ? value : $"{value} ({note})";
}
