using System.Globalization;

namespace DriftWatch.Core.Profiling;

/// <summary>
/// Writes an exact affine relationship as text, "y = 0.45359237·x" or "y = 1.8·x + 32": each
/// coefficient with the fewest significant digits that reproduce it (so a factor fitted as
/// 0.45359237000000004 reads as its definition), an intercept that is zero at the data's scale
/// left out, a unit slope written as "x".
/// </summary>
internal static class EquationText
{
    /// <summary>Relative agreement at which a shorter rendering of the slope is the same number.</summary>
    private const double DigitTolerance = 1e-10;

    /// <param name="interceptZero">|intercept| below which it is zero at the data's scale.</param>
    public static string Affine(double slope, double intercept, double interceptZero)
    {
        string slopeText = Shortest(slope, Math.Abs(slope) * DigitTolerance);
        string xTerm = slopeText switch
        {
            "1" => "x",
            "-1" => "-x",
            _ => slopeText + "·x",
        };

        if (Math.Abs(intercept) <= interceptZero)
        {
            return "y = " + xTerm;
        }

        string interceptText = Shortest(Math.Abs(intercept), Math.Max(interceptZero, Math.Abs(intercept) * DigitTolerance));
        return "y = " + xTerm + (intercept < 0 ? " - " : " + ") + interceptText;
    }

    /// <summary>The shortest "G" rendering within <paramref name="tolerance"/> of the value.</summary>
    internal static string Shortest(double value, double tolerance)
    {
        for (int digits = 1; digits <= 16; digits++)
        {
            string text = value.ToString("G" + digits.ToString(CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
            double back = double.Parse(text, CultureInfo.InvariantCulture);
            if (Math.Abs(back - value) <= tolerance)
            {
                // "G" alone would write 1000 at one digit as "1E+03"; the round-trip form of the
                // rounded number reads naturally ("1000", "0.45359237").
                return back.ToString("R", CultureInfo.InvariantCulture);
            }
        }

        return value.ToString("R", CultureInfo.InvariantCulture);
    }
}
