using DriftWatch.Output;

namespace DriftWatch.Plots;

/// <summary>
/// A fitted equation as a reader writes it: "y = 8613 − 34.48·x", "y = 2.1 + 0.8·x − 0.013·x²". Each
/// coefficient to <see cref="Figures.Digits"/> significant digits, the sign joined into the operator,
/// a term that rounds to zero left out (the constant too, unless it is the only term).
/// </summary>
internal static class FitEquation
{
    public static string Line(double intercept, double slope) => Polynomial([intercept, slope]);

    public static string Quadratic(double a, double b, double c) => Polynomial([a, b, c]);

    private static string Polynomial(double[] coefficients)
    {
        var text = new System.Text.StringBuilder("y =");
        var first = true;
        for (var power = 0; power < coefficients.Length; power++)
        {
            var value = Figures.RoundSignificant(coefficients[power], Figures.Digits);
            if (value == 0)
            {
                continue;
            }

            var magnitude = Math.Abs(value);
            var number = Figures.Coefficient(magnitude);
            var term = power switch
            {
                0 => number,
                _ => (number == "1" ? string.Empty : number + "·") + (power == 1 ? "x" : "x²"),
            };
            if (first)
            {
                text.Append(' ').Append(value < 0 ? Figures.Minus.ToString() : string.Empty).Append(term);
                first = false;
            }
            else
            {
                text.Append(value < 0 ? " − " : " + ").Append(term);
            }
        }

        return first ? "y = 0" : text.ToString();
    }
}
