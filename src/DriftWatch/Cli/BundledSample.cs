using System.Reflection;

namespace DriftWatch.Cli;

/// <summary>
/// The invented extracts that ship inside the executable, so <c>driftwatch profile</c> shows something
/// with no data at hand: four branches of a bakery chain, daily oven hours against loaves baked. In the
/// baseline the loaves were counted at closing; in the current extract a new import job fills
/// loaves_baked from the oven plan (118 per hour), so the relationship became exact.
/// </summary>
internal static class BundledSample
{
    public const string XColumn = "oven_hours";
    public const string YColumn = "loaves_baked";
    public const string CurrentName = "bakery_current.csv";
    public const string BaselineName = "bakery_baseline.csv";

    /// <summary>Slope of the current extract by construction (loaves_baked = 118 × oven_hours).</summary>
    public const double CurrentLoavesPerHour = 118;

    public static TextReader Open(string name)
    {
        var resource = "DriftWatch.Samples." + name;
        var stream = Assembly.GetExecutingAssembly().GetManifestResourceStream(resource)
            ?? throw new InvalidOperationException($"The bundled sample {resource} is missing from the build.");
        return new StreamReader(stream);
    }
}
