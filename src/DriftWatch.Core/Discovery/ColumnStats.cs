namespace DriftWatch.Core.Discovery;

/// <summary>
/// One column's first-pass figures over the whole table: how many rows, how many finite values, and the finite range.
/// The range gives the centre and the power-of-two scale the matrix statement applies to the column, so that no
/// sum of squares or cross product can overflow or lose its digits to a large offset.
/// </summary>
/// <param name="Rows">Rows of the table.</param>
/// <param name="Finite">Rows whose value is a finite number.</param>
/// <param name="Nulls">Rows whose value is null.</param>
public sealed record ColumnStats(string Name, long Rows, long Finite, long Nulls, double? Min, double? Max)
{
    /// <summary>Values whose scaled deviation is below this are taken as the centre itself (their squares would underflow in PostgreSQL).</summary>
    public const double DeviationFloor = 1e-150;

    /// <summary>Rows whose value is NaN, ±infinity, or not a number at all (text stored in a SQLite column).</summary>
    public long NonFinite => Rows - Finite - Nulls;

    /// <summary>Every row holds a finite value: its pairs need no per-pair counts or sums.</summary>
    public bool Complete => Finite == Rows;

    /// <summary>No spread: a correlation with this column is undefined.</summary>
    public bool Constant => Finite == 0 || Min == Max;

    /// <summary>A power of two that maps the largest |value| into [0.5, 1): scaling by it is exact.</summary>
    public double Factor
    {
        get
        {
            var largest = Math.Max(Math.Abs(Min ?? 0), Math.Abs(Max ?? 0));
            return largest == 0 ? 1 : Math.ScaleB(1.0, -(Math.ILogB(largest) + 1));
        }
    }

    /// <summary>The scaled centre the deviations are taken from: the middle of the range (no sum is needed to find it).</summary>
    public double ScaledCentre => Min is { } lo && Max is { } hi ? (lo * Factor * 0.5) + (hi * Factor * 0.5) : 0;

    /// <summary>|value| below which value·<see cref="Factor"/> is read as 0 rather than risk an underflow.</summary>
    public double ValueFloor => Math.ScaleB(1.0, -900) / Factor;
}
