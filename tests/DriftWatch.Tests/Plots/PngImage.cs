using System.Buffers.Binary;
using SkiaSharp;

namespace DriftWatch.Tests.Plots;

/// <summary>Checks a PNG the way the format's standard defines it, then decodes it with SkiaSharp as an independent reader.</summary>
internal static class PngImage
{
    // PNG specification (W3C Recommendation / ISO/IEC 15948), section 5.2: the 8-byte signature; section 11.2.2:
    // IHDR is the first chunk, width and height big-endian at bytes 16..23 of the file.
    private static readonly byte[] Signature = [0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A];

    public static (int Width, int Height) AssertValid(byte[] png)
    {
        Assert.True(png.Length > 33, "too short for a PNG");
        Assert.Equal(Signature, png[..8]);
        Assert.Equal("IHDR"u8.ToArray(), png[12..16]);
        var width = BinaryPrimitives.ReadInt32BigEndian(png.AsSpan(16, 4));
        var height = BinaryPrimitives.ReadInt32BigEndian(png.AsSpan(20, 4));

        using var bitmap = SKBitmap.Decode(png);
        Assert.NotNull(bitmap);
        Assert.Equal(width, bitmap.Width);
        Assert.Equal(height, bitmap.Height);
        return (width, height);
    }

    /// <summary>How many pixels match <paramref name="predicate"/>.</summary>
    public static int Count(byte[] png, Func<SKColor, bool> predicate)
    {
        using var bitmap = SKBitmap.Decode(png);
        var count = 0;
        for (var y = 0; y < bitmap.Height; y++)
        {
            for (var x = 0; x < bitmap.Width; x++)
            {
                if (predicate(bitmap.GetPixel(x, y)))
                {
                    count++;
                }
            }
        }

        return count;
    }
}
