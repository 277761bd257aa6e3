using System.Globalization;

namespace DriftWatch.Configuration;

/// <summary>The interval a number key accepts, written into its message ("between 0 and 1 (exclusive)").</summary>
internal sealed record NumberRange(double Min, bool MinInclusive, double Max, bool MaxInclusive)
{
    public static NumberRange Positive { get; } = new(0, false, double.PositiveInfinity, false);

    public static NumberRange NonNegative { get; } = new(0, true, double.PositiveInfinity, false);

    public static NumberRange Fraction { get; } = new(0, true, 1, true);

    public static NumberRange OpenUnit { get; } = new(0, false, 1, false);

    public bool Contains(double value) =>
        (MinInclusive ? value >= Min : value > Min) && (MaxInclusive ? value <= Max : value < Max);

    public override string ToString()
    {
        var min = Min.ToString(CultureInfo.InvariantCulture);
        var max = Max.ToString(CultureInfo.InvariantCulture);
        if (double.IsPositiveInfinity(Max))
        {
            return MinInclusive ? $"at least {min}" : $"greater than {min}";
        }

        return (MinInclusive, MaxInclusive) switch
        {
            (true, true) => $"between {min} and {max}",
            (false, false) => $"between {min} and {max}, exclusive",
            (true, false) => $"at least {min} and less than {max}",
            _ => $"greater than {min} and at most {max}",
        };
    }
}
