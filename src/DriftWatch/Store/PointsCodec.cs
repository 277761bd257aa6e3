using System.Buffers.Binary;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Store;

/// <summary>
/// Sampled points as a blob: interleaved x, y pairs of IEEE-754 doubles, little-endian, 16 bytes a point,
/// no header. Compact, exact (no text round trip), and identical in SQLite and PostgreSQL.
/// The drop counts of a sample are not stored here (the profile holds them).
/// </summary>
internal static class PointsCodec
{
    private const int BytesPerPoint = 2 * sizeof(double);

    public static byte[] Encode(PairedSample sample)
    {
        ArgumentNullException.ThrowIfNull(sample);
        var bytes = new byte[sample.UsedCount * BytesPerPoint];
        var span = bytes.AsSpan();
        for (var i = 0; i < sample.UsedCount; i++)
        {
            BinaryPrimitives.WriteDoubleLittleEndian(span[(i * BytesPerPoint)..], sample.X[i]);
            BinaryPrimitives.WriteDoubleLittleEndian(span[((i * BytesPerPoint) + sizeof(double))..], sample.Y[i]);
        }

        return bytes;
    }

    public static PairedSample Decode(ReadOnlySpan<byte> bytes)
    {
        if (bytes.Length % BytesPerPoint != 0)
        {
            throw new FormatException($"A points blob must hold whole x,y pairs of 16 bytes; this one has {bytes.Length} bytes.");
        }

        var n = bytes.Length / BytesPerPoint;
        var x = new double[n];
        var y = new double[n];
        for (var i = 0; i < n; i++)
        {
            x[i] = BinaryPrimitives.ReadDoubleLittleEndian(bytes[(i * BytesPerPoint)..]);
            y[i] = BinaryPrimitives.ReadDoubleLittleEndian(bytes[((i * BytesPerPoint) + sizeof(double))..]);
        }

        return new PairedSample(x, y);
    }

    /// <summary>
    /// At most <paramref name="maxPoints"/> points, evenly strided through the sample (deterministic; keeps
    /// the first point and spreads over the whole extract, which matters when a source returns rows in time order).
    /// </summary>
    public static PairedSample Thin(PairedSample sample, int maxPoints)
    {
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentOutOfRangeException.ThrowIfNegative(maxPoints);
        var n = sample.UsedCount;
        if (n <= maxPoints)
        {
            return sample;
        }

        var x = new double[maxPoints];
        var y = new double[maxPoints];
        for (var i = 0; i < maxPoints; i++)
        {
            var source = (int)((long)i * n / maxPoints);
            x[i] = sample.X[source];
            y[i] = sample.Y[source];
        }

        return new PairedSample(x, y, sample.NullCount, sample.NonFiniteCount, sample.NonNumericCount);
    }
}
