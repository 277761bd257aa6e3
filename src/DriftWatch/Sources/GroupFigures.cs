using DriftWatch.Core.History;

namespace DriftWatch.Sources;

/// <summary>
/// A column's sums in a shared aggregate, over the rows where it is finite, of d = value − reference
/// (d is 0 where the value is null or not finite).
/// </summary>
/// <param name="Finite">Rows with a finite value; −1 when a lean read found a value that is not finite (its sums are then unknown).</param>
internal sealed record ColumnSums(long Finite, double Sum, double Squares, long Nulls)
{
    /// <summary>The column's mean over its finite rows; null without any, or when unknown.</summary>
    public double? Mean(double reference) => Finite <= 0 ? null : reference + (Sum / Finite);
}

/// <summary>
/// A pair's part of a shared aggregate: Σ dx·dy over all rows (zero outside the pair's usable rows), and what the
/// rows the pair cannot use (x or y null or not finite) add to its columns' sums, to be taken off them.
/// </summary>
internal sealed record PairSums(double Cross, long Excluded, long Nulls, double XSumExcluded, double XSquaresExcluded, double YSumExcluded, double YSquaresExcluded);

/// <summary>
/// A pair's <see cref="SourceFigures"/> from shared sums of shifted values: the same figures PostgreSQL's
/// count/avg/var_samp/corr/regr_slope/regr_intercept give over the rows where both values are finite, with the
/// same NULLs (no rows, one row, zero spread). The centred sums Sxx = Σd² − (Σd)²/n lose digits when the
/// reference lies far from the mean (by the factor Σd² / Sxx); beyond <see cref="MaxLoss"/> the figures are not
/// given (null) and the caller shifts again by the mean or reads the pair alone.
/// </summary>
internal static class GroupFigures
{
    /// <summary>Σd² may exceed the centred Sxx by this factor: the reference lies within √3 standard deviations of the mean.</summary>
    public const double MaxLoss = 4;

    public static SourceFigures? Of(long rows, double xReference, ColumnSums x, double yReference, ColumnSums y, PairSums pair)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        ArgumentNullException.ThrowIfNull(pair);
        var n = rows - pair.Excluded;
        if (n <= 0)
        {
            return new SourceFigures(rows, 0, pair.Nulls, null, null, null, null, null, null, null);
        }

        var sx = x.Sum - pair.XSumExcluded;
        var sy = y.Sum - pair.YSumExcluded;
        var cxx = Centred(x.Squares - pair.XSquaresExcluded, sx, n);
        var cyy = Centred(y.Squares - pair.YSquaresExcluded, sy, n);
        if (cxx is not { } vx || cyy is not { } vy)
        {
            return null;
        }

        var cxy = pair.Cross - (sx * sy / n);
        double meanX = xReference + (sx / n), meanY = yReference + (sy / n);
        double? slope = vx == 0 ? null : cxy / vx;
        var figures = new SourceFigures(
            rows,
            n,
            pair.Nulls,
            vx == 0 || vy == 0 ? null : cxy / (Math.Sqrt(vx) * Math.Sqrt(vy)),
            slope,
            slope is { } b ? meanY - (b * meanX) : null,
            meanX,
            meanY,
            n > 1 ? vx / (n - 1) : null,
            n > 1 ? vy / (n - 1) : null);
        // The centred sums keep their digits (checked above), so a small spread on a huge offset, which the lone
        // check must rescale for PostgreSQL's one-pass sums, needs nothing more here.
        var finite = double.IsFinite(cxy) && double.IsFinite(meanX) && double.IsFinite(meanY) && (figures.PearsonR is not { } r || double.IsFinite(r));
        return finite ? figures : null;
    }

    /// <summary>Σd² − (Σd)²/n when it keeps its digits: exactly 0 when every d is 0, null when too many digits are lost.</summary>
    private static double? Centred(double squares, double sum, long n)
    {
        if (!double.IsFinite(squares) || !double.IsFinite(sum))
        {
            return null;
        }

        // One row, or every value equal to the reference: no spread at all, as the engine's exact sums say.
        if (squares == 0 || n == 1)
        {
            return 0;
        }

        var centred = squares - (sum * sum / n);
        return centred > 0 && squares <= MaxLoss * centred ? centred : null;
    }
}
