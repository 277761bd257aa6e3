namespace DriftWatch.Core.Findings;

/// <summary>
/// Conversion factors between units that data pipelines mix up. A slope ratio near one of them (or
/// its inverse) says a column changed unit: r stays, the slope moves by the factor. The factors are
/// exact by definition (NIST SP 811, appendix B) except the rounded lb/kg figure shown to users.
/// </summary>
internal static class UnitFactors
{
    private static readonly (double Factor, string Description)[] Known =
    [
        (1000, "for example g and kg, or m and km"),
        (100, "for example percent and fraction, or cm and m"),
        (1 / 0.45359237, "pounds and kilograms"),
        (1.609344, "miles and kilometres"),
        (3.6, "kWh and MJ, or m/s and km/h"),
    ];

    /// <param name="tolerance">The largest relative distance |ratio/factor − 1| at which the ratio still "is" the factor.</param>
    /// <returns>The factor (or inverse) nearest to the ratio on a log scale among those within the tolerance, written as the user would; or null.</returns>
    public static (string Factor, string Description)? Match(double ratio, double tolerance)
    {
        if (!(ratio > 0) || !double.IsFinite(ratio))
        {
            return null;
        }

        (string Factor, string Description)? best = null;
        double bestDistance = double.MaxValue;
        foreach (var (factor, description) in Known)
        {
            foreach (var (value, text) in new[] { (factor, FactorText(factor)), (1 / factor, "1/" + FactorText(factor)) })
            {
                double distance = Math.Abs(Math.Log(ratio / value));
                if (Math.Abs((ratio / value) - 1) <= tolerance && distance < bestDistance)
                {
                    best = (text, description);
                    bestDistance = distance;
                }
            }
        }

        return best;
    }

    private static string FactorText(double factor) =>
        Math.Abs(factor - (1 / 0.45359237)) < 1e-9 ? "2.20462" : Profiling.Numbers.Sig(factor, 7);
}
