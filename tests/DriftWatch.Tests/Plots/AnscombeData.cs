using DriftWatch.Core.Profiling;

namespace DriftWatch.Tests.Plots;

/// <summary>
/// Anscombe (1973), "Graphs in Statistical Analysis", The American Statistician 27(1): the quartet's sets I and
/// III, which share x and the fitted line y = 3.00 + 0.500 x (values from memory; the published table).
/// </summary>
internal static class AnscombeData
{
    public static readonly double[] X = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    public static readonly double[] Y1 = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    public static readonly double[] Y3 = [7.46, 6.77, 12.74, 7.11, 7.81, 8.84, 6.08, 5.39, 8.15, 6.42, 5.73];

    public const double Intercept = 3.00;
    public const double Slope = 0.500;

    public static PairedSample Set1 => new(X, Y1);

    public static PairedSample Set3 => new(X, Y3);

    public static RelationshipProfile Fit => new() { NUsed = 11, NRows = 11, Intercept = Intercept, Slope = Slope, PearsonR = 0.816 };
}
