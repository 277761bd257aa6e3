namespace DriftWatch.Output;

/// <summary>
/// Figures joined into the phrases the CLI tables print ("9.000 ± 3.317", "0.8164 [0.4244, 0.9507]"); each
/// figure itself comes from <see cref="Figures"/>.
/// </summary>
internal static class Readable
{
    public static string YesNo(bool value) => value ? "yes" : "no";

    /// <summary>"9.000 ± 3.317".</summary>
    public static string WithSpread(double? centre, double? spread) =>
        spread is null ? Figures.Number(centre) : $"{Figures.Number(centre)} ± {Figures.Number(spread)}";

    /// <summary>"0.8164 [0.4244, 0.9507]".</summary>
    public static string WithInterval(double? value, double? low, double? high) =>
        low is null || high is null ? Figures.Number(value) : $"{Figures.Number(value)} [{Figures.Number(low)}, {Figures.Number(high)}]";

    /// <summary>"3 (9.091%)"; the note is left out when there is none.</summary>
    public static string WithNote(string value, string? note) => note is null ? value : $"{value} ({note})";
}
