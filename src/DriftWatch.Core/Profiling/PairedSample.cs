namespace DriftWatch.Core.Profiling;

/// <summary>
/// The usable (finite) x/y pairs of one extract, plus how many rows were dropped and why.
/// X and Y always have the same length.
/// </summary>
public sealed record PairedSample
{
    public PairedSample(double[] x, double[] y, int nullCount = 0, int nonFiniteCount = 0, int nonNumericCount = 0)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        if (x.Length != y.Length)
        {
            throw new ArgumentException($"x has {x.Length} values but y has {y.Length}.", nameof(y));
        }

        X = x;
        Y = y;
        NullCount = nullCount;
        NonFiniteCount = nonFiniteCount;
        NonNumericCount = nonNumericCount;
    }

    public double[] X { get; }

    public double[] Y { get; }

    /// <summary>Rows where x or y was null (or an empty cell).</summary>
    public int NullCount { get; }

    /// <summary>Rows where x or y was NaN or ±infinity.</summary>
    public int NonFiniteCount { get; }

    /// <summary>Rows where x or y could not be read as a number at all (CSV text cells).</summary>
    public int NonNumericCount { get; }

    public int UsedCount => X.Length;

    public int RowCount => X.Length + NullCount + NonFiniteCount + NonNumericCount;

    public static PairedSample Empty { get; } = new([], []);

    /// <summary>Builds a sample from nullable rows, dropping and counting nulls and non-finite values.</summary>
    public static PairedSample FromRows(IEnumerable<(double? X, double? Y)> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var builder = new PairedSampleBuilder();
        foreach (var (x, y) in rows)
        {
            builder.Add(x, y);
        }

        return builder.Build();
    }
}
