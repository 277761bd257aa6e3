using System.Globalization;
using System.Text.RegularExpressions;

namespace DriftWatch.Calibration.Reporting;

/// <summary>
/// Whether a finding's message names a unit factor: the factor as people write it (1.609344, 2.20462, 1000, 100,
/// 3.6; "1/f" for the inverse, or the inverse's decimal to 3 or 4 significant digits), as a whole number, not
/// part of another one (so 100 is not found in 1000).
/// </summary>
internal static class UnitFactorNaming
{
    public static bool Names(string message, double slopeRatio)
    {
        ArgumentNullException.ThrowIfNull(message);
        return Spellings(slopeRatio).Any(s => Regex.IsMatch(message, $@"(?<![\d.,/]){Regex.Escape(s)}(?![\d]|[.,]\d)", RegexOptions.CultureInvariant));
    }

    public static IReadOnlyList<string> Spellings(double slopeRatio)
    {
        if (slopeRatio >= 1)
        {
            return Forms(slopeRatio);
        }

        var inverse = 1 / slopeRatio;
        var list = Forms(inverse).Select(f => "1/" + f).ToList();
        list.Add(slopeRatio.ToString("G3", CultureInfo.InvariantCulture));
        list.Add(slopeRatio.ToString("G4", CultureInfo.InvariantCulture));
        return list;
    }

    private static List<string> Forms(double factor)
    {
        var rounded = Math.Round(factor, 6);
        var list = new List<string> { rounded.ToString("0.######", CultureInfo.InvariantCulture) };
        if (rounded >= 1000 && rounded == Math.Floor(rounded))
        {
            list.Add(rounded.ToString("#,0", CultureInfo.InvariantCulture));
        }

        return list;
    }
}
