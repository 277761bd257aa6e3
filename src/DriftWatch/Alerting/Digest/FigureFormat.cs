using System.Globalization;

namespace DriftWatch.Alerting.Digest;

/// <summary>How numbers read in a digest; invariant culture, "—" for a figure that is undefined.</summary>
internal static class FigureFormat
{
    public const string Missing = "—";

    public static string Count(long? value) => value?.ToString("N0", CultureInfo.InvariantCulture) ?? Missing;

    public static string Correlation(double? value) => value?.ToString("0.000", CultureInfo.InvariantCulture) ?? Missing;

    public static string Number(double? value) => value?.ToString("G4", CultureInfo.InvariantCulture) ?? Missing;

    public static string PValue(double? value) => value switch
    {
        null => Missing,
        < 0.001 => "< 0.001",
        _ => value.Value.ToString("0.000", CultureInfo.InvariantCulture),
    };

    public static string Percent(double? fraction) => fraction is null ? Missing : (fraction.Value * 100).ToString("0.0", CultureInfo.InvariantCulture) + " %";

    public static string Time(DateTimeOffset at) => at.UtcDateTime.ToString("yyyy-MM-dd HH:mm 'UTC'", CultureInfo.InvariantCulture);
}
