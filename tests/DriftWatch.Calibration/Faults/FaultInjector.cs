using DriftWatch.Calibration.Generation;

namespace DriftWatch.Calibration.Faults;

/// <summary>
/// Applies a fault to one day's healthy rows. Faults that follow the pair's line (the affine derivation, the
/// slope change, the offset) use the least-squares line and residual SD of that day's own rows, so they fit
/// every family, curved ones included.
/// </summary>
internal static class FaultInjector
{
    public static CalibrationRow[] Apply(FaultCase fault, CalibrationRow[] rows, Random rng)
    {
        ArgumentNullException.ThrowIfNull(fault);
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(rng);
        var line = DayLine.Fit(rows);
        var output = (CalibrationRow[])rows.Clone();
        switch (fault.Type)
        {
            case FaultType.CopyXIntoY:
                Each(output, r => r with { Y = r.X });
                break;
            case FaultType.AffineDerivation:
                foreach (var i in Pick(output.Length, fault.Size, rng))
                {
                    output[i] = output[i] with { Y = line.Intercept + (line.Slope * output[i].X) };
                }

                break;
            case FaultType.UnitChange when fault.Column == FaultColumn.Y:
                Each(output, r => r with { Y = r.Y * fault.Size });
                break;
            case FaultType.UnitChange:
                Each(output, r => r with { X = r.X * fault.Size });
                break;
            case FaultType.SlopeChange:
                // Turns the line about x's mean, so the slope moves by the share and the level at the mean stays.
                Each(output, r => r with { Y = r.Y + (fault.Size * line.Slope * (r.X - line.XMean)) });
                break;
            case FaultType.Offset:
                Each(output, r => r with { Y = r.Y + (fault.Size * line.ResidualSd) });
                break;
            case FaultType.KeyMisalignment:
            {
                // y values move to other rows among the chosen ones (a join on a shifted key).
                var chosen = Pick(output.Length, fault.Size, rng);
                var ys = chosen.Select(i => output[i].Y).ToArray();
                rng.Shuffle(ys);
                for (var k = 0; k < chosen.Length; k++)
                {
                    output[chosen[k]] = output[chosen[k]] with { Y = ys[k] };
                }

                break;
            }

            case FaultType.Sentinel:
                foreach (var i in Pick(output.Length, fault.Size, rng))
                {
                    output[i] = fault.Column == FaultColumn.Y ? output[i] with { Y = fault.Value } : output[i] with { X = fault.Value };
                }

                break;
            case FaultType.Nulls:
                foreach (var i in Pick(output.Length, fault.Size, rng))
                {
                    output[i] = fault.Column == FaultColumn.Y ? output[i] with { Y = null } : output[i] with { X = null };
                }

                break;
            case FaultType.SignFlip:
                Each(output, r => r with { Y = -r.Y });
                break;
            case FaultType.RowsCut:
                // Rows are independent draws, so the first ones are a random subset.
                return output[..(int)Math.Ceiling(output.Length * fault.Size)];
            case FaultType.Cap:
            {
                var ys = output.Where(r => r.Y is not null).Select(r => r.Y!.Value).Order().ToArray();
                var cap = ys[(int)Math.Floor(fault.Size * (ys.Length - 1))];
                Each(output, r => r with { Y = r.Y is { } y ? Math.Min(y, cap) : null });
                break;
            }

            case FaultType.AggregateRow:
            {
                // The column totals, loaded as one more row among the detail rows (at a random position).
                var total = new CalibrationRow(output.Sum(r => r.X ?? 0), output.Sum(r => r.Y ?? 0));
                var at = rng.Next(output.Length + 1);
                return [.. output[..at], total, .. output[at..]];
            }

            default:
                throw new ArgumentOutOfRangeException(nameof(fault), fault.Type, null);
        }

        return output;
    }

    private static void Each(CalibrationRow[] rows, Func<CalibrationRow, CalibrationRow> change)
    {
        for (var i = 0; i < rows.Length; i++)
        {
            rows[i] = change(rows[i]);
        }
    }

    /// <summary>A random share of the row indexes, without repetition.</summary>
    private static int[] Pick(int count, double share, Random rng)
    {
        var all = Enumerable.Range(0, count).ToArray();
        rng.Shuffle(all);
        return all[..(int)Math.Round(count * Math.Clamp(share, 0, 1))];
    }
}
