using System.Buffers;

namespace DriftWatch.Core.Statistics;

/// <summary>
/// Sorts doubles with their row indices by a least-significant-digit radix sort on the IEEE bits
/// mapped to an order-preserving unsigned key. Array.Sort(keys, items) is a comparison sort and
/// took most of a million-row profile (two sorts, ~150 ms); six 11-bit passes, most of them
/// skipped because real columns share their sign and exponent bits, take a fraction of that.
/// Input must be finite; −0 sorts with +0.
/// </summary>
internal static class RadixSort
{
    private const int DigitBits = 11;
    private const int Buckets = 1 << DigitBits;
    private const int Passes = (64 + DigitBits - 1) / DigitBits;
    private const ulong SignBit = 1UL << 63;

    /// <summary>Order-preserving map of a finite double to an unsigned key.</summary>
    public static ulong Key(double value)
    {
        // Adding 0.0 turns −0 into +0, so equal values get equal keys.
        ulong bits = (ulong)BitConverter.DoubleToInt64Bits(value + 0.0);
        return (bits & SignBit) != 0 ? ~bits : bits | SignBit;
    }

    /// <summary>Sorted keys (see <see cref="Key"/>) and, in the same order, the row each came from.</summary>
    public static (ulong[] Keys, int[] Rows) Sort(double[] values)
    {
        ArgumentNullException.ThrowIfNull(values);
        int n = values.Length;
        var keys = GC.AllocateUninitializedArray<ulong>(n);
        var rows = GC.AllocateUninitializedArray<int>(n);
        var keysOut = ArrayPool<ulong>.Shared.Rent(n);
        var rowsOut = ArrayPool<int>.Shared.Rent(n);
        try
        {
            return Sort(values, keys, rows, keysOut, rowsOut);
        }
        finally
        {
            ArrayPool<ulong>.Shared.Return(keysOut);
            ArrayPool<int>.Shared.Return(rowsOut);
        }
    }

    /// <summary>
    /// The sort proper; the scatter buffers (at least n long) come from the pool. An odd number of
    /// passes leaves the result in a buffer, so it is copied back into the caller's arrays.
    /// </summary>
    private static (ulong[] Keys, int[] Rows) Sort(double[] values, ulong[] keys, int[] rows, ulong[] keysOut, int[] rowsOut)
    {
        int n = values.Length;
        var resultKeys = keys;
        var resultRows = rows;
        var counts = new int[Passes * Buckets];
        for (int i = 0; i < n; i++)
        {
            ulong key = Key(values[i]);
            keys[i] = key;
            rows[i] = i;
            for (int pass = 0; pass < Passes; pass++)
            {
                counts[(pass * Buckets) + (int)((key >> (pass * DigitBits)) & (Buckets - 1))]++;
            }
        }

        var offsets = new int[Buckets];
        for (int pass = 0; pass < Passes; pass++)
        {
            int baseIndex = pass * Buckets;
            int first = (int)((n > 0 ? keys[0] : 0) >> (pass * DigitBits)) & (Buckets - 1);
            if (n == 0 || counts[baseIndex + first] == n)
            {
                // Every key has the same digit here: the pass would not move anything.
                continue;
            }

            int running = 0;
            for (int b = 0; b < Buckets; b++)
            {
                offsets[b] = running;
                running += counts[baseIndex + b];
            }

            int shift = pass * DigitBits;
            for (int i = 0; i < n; i++)
            {
                ulong key = keys[i];
                int at = offsets[(int)(key >> shift) & (Buckets - 1)]++;
                keysOut[at] = key;
                rowsOut[at] = rows[i];
            }

            (keys, keysOut) = (keysOut, keys);
            (rows, rowsOut) = (rowsOut, rows);
        }

        if (!ReferenceEquals(keys, resultKeys))
        {
            Array.Copy(keys, resultKeys, n);
            Array.Copy(rows, resultRows, n);
        }

        return (resultKeys, resultRows);
    }

    /// <summary>
    /// The sorted keys alone (for the Kolmogorov–Smirnov statistic, which needs order and equality,
    /// not values or rows).
    /// </summary>
    public static ulong[] SortKeys(double[] values)
    {
        ArgumentNullException.ThrowIfNull(values);
        int n = values.Length;
        var keys = GC.AllocateUninitializedArray<ulong>(n);
        var counts = new int[Passes * Buckets];
        for (int i = 0; i < n; i++)
        {
            ulong key = Key(values[i]);
            keys[i] = key;
            for (int pass = 0; pass < Passes; pass++)
            {
                counts[(pass * Buckets) + (int)((key >> (pass * DigitBits)) & (Buckets - 1))]++;
            }
        }

        var buffer = ArrayPool<ulong>.Shared.Rent(n);
        var source = keys;
        var target = buffer;
        var offsets = new int[Buckets];
        for (int pass = 0; pass < Passes && n > 0; pass++)
        {
            int baseIndex = pass * Buckets;
            int shift = pass * DigitBits;
            if (counts[baseIndex + (int)((source[0] >> shift) & (Buckets - 1))] == n)
            {
                continue;
            }

            int running = 0;
            for (int b = 0; b < Buckets; b++)
            {
                offsets[b] = running;
                running += counts[baseIndex + b];
            }

            for (int i = 0; i < n; i++)
            {
                ulong key = source[i];
                target[offsets[(int)(key >> shift) & (Buckets - 1)]++] = key;
            }

            (source, target) = (target, source);
        }

        if (!ReferenceEquals(source, keys))
        {
            Array.Copy(source, keys, n);
        }

        ArrayPool<ulong>.Shared.Return(buffer);
        return keys;
    }
}
