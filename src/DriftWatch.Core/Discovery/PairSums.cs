namespace DriftWatch.Core.Discovery;

/// <summary>
/// The sums of one pair over its pairwise-complete rows, of values centred near their middle (so the corrections
/// below are small against the sums and cancel little, the two-pass remedy for raw sums of squares).
/// </summary>
public readonly record struct PairSums(long N, double SumX, double SumY, double SumXX, double SumYY, double SumXY)
{
    /// <summary>
    /// A centred sum of squares at or below this share of its raw sum is rounding residue, not spread: the column is
    /// constant on the pair's rows.
    /// </summary>
    private const double ResidueShare = 64 * 2.220446049250313e-16;

    /// <summary>Pearson's r = Sxy / √(Sxx·Syy), with S the sums of squares and products about the means; null below 3 rows or without spread.</summary>
    public double? Pearson()
    {
        if (N < 3)
        {
            return null;
        }

        double sxx = SumXX - (SumX * SumX / N);
        double syy = SumYY - (SumY * SumY / N);
        double sxy = SumXY - (SumX * SumY / N);
        if (!(sxx > ResidueShare * SumXX) || !(syy > ResidueShare * SumYY))
        {
            return null;
        }

        // √Sxx·√Syy rather than √(Sxx·Syy): the product can underflow where neither factor does.
        double r = sxy / (Math.Sqrt(sxx) * Math.Sqrt(syy));
        return double.IsFinite(r) ? Math.Clamp(r, -1, 1) : null;
    }
}
