namespace DriftWatch.Core.Statistics;

/// <summary>
/// One column scaled by an exact power of two (so |value| &lt; 1) and centred on its mean.
/// Power-of-two scaling loses no digit and keeps squares far from overflow (values near 1e150
/// would overflow a plain sum of squares); centring with a corrected two-pass mean keeps the
/// digits of a small spread on a large common offset (the NIST NumAcc sets).
/// </summary>
internal sealed class CenteredColumn
{
    private CenteredColumn(double[] deviations, int exponent, double scaledMean, double sumSquares, double maxAbsScaled, bool isConstant)
    {
        Deviations = deviations;
        Exponent = exponent;
        ScaledMean = scaledMean;
        SumSquares = sumSquares;
        MaxAbsScaled = maxAbsScaled;
        IsConstant = isConstant;
    }

    /// <summary>(value · 2^-Exponent) − ScaledMean, per row.</summary>
    public double[] Deviations { get; }

    public int Exponent { get; }

    public double ScaledMean { get; }

    /// <summary>Σ deviation², in scaled units.</summary>
    public double SumSquares { get; }

    /// <summary>max |value| · 2^-Exponent (below 1).</summary>
    public double MaxAbsScaled { get; }

    /// <summary>Every value is identical (not merely a tiny spread).</summary>
    public bool IsConstant { get; }

    public int Count => Deviations.Length;

    public double Mean => Math.ScaleB(ScaledMean, Exponent);

    /// <summary>Sample SD (n − 1 denominator); 0 for a constant column; needs at least 2 values.</summary>
    public double StandardDeviation => Math.ScaleB(Math.Sqrt(SumSquares / (Count - 1)), Exponent);

    /// <summary>Multiplies a scaled quantity back into the column's units.</summary>
    public double Unscale(double scaled) => Math.ScaleB(scaled, Exponent);

    public static CenteredColumn Of(double[] values)
    {
        ArgumentNullException.ThrowIfNull(values);
        int n = values.Length;
        // Every element is written below (or cleared for a constant column): skip the zeroing.
        var deviations = GC.AllocateUninitializedArray<double>(n);
        if (n == 0)
        {
            return new CenteredColumn(deviations, 0, 0, 0, 0, true);
        }

        double min = values[0], max = values[0];
        for (int i = 1; i < n; i++)
        {
            double v = values[i];
            if (v < min)
            {
                min = v;
            }
            else if (v > max)
            {
                max = v;
            }
        }

        double maxAbs = Math.Max(Math.Abs(min), Math.Abs(max));
        // Subnormal columns would need a factor above 2^1023, which overflows; 2^1021 is enough there.
        int exponent = maxAbs == 0 ? 0 : Math.Max(Math.ILogB(maxAbs) + 1, -1021);
        double factor = Math.ScaleB(1.0, -exponent);
        if (min == max)
        {
            // Exactly constant: the mean is the value itself, not a rounded sum divided by n.
            Array.Clear(deviations);
            return new CenteredColumn(deviations, exponent, min * factor, 0, maxAbs * factor, true);
        }

        double sum = 0;
        for (int i = 0; i < n; i++)
        {
            sum += values[i] * factor;
        }

        double mean = sum / n;

        // Second pass: deviations from the first mean, and the mean of those deviations, which
        // corrects the rounding of the first sum (the "corrected two-pass" algorithm).
        double correction = 0;
        for (int i = 0; i < n; i++)
        {
            double d = (values[i] * factor) - mean;
            deviations[i] = d;
            correction += d;
        }

        correction /= n;
        double sumSquares = 0;
        for (int i = 0; i < n; i++)
        {
            double d = deviations[i] - correction;
            deviations[i] = d;
            sumSquares += d * d;
        }

        return new CenteredColumn(deviations, exponent, mean + correction, sumSquares, maxAbs * factor, false);
    }
}
