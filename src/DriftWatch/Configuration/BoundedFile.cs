using System.Text;

namespace DriftWatch.Configuration;

/// <summary>
/// Reads a small text file without trusting its reported length: a device (<c>/dev/zero</c>), a pipe or a file
/// that grows while it is read all report a length that says nothing about what a read returns. Reading stops at
/// the limit plus one byte, so memory stays bounded whatever the path names.
/// </summary>
internal static class BoundedFile
{
    /// <summary>The file's text (a byte-order mark decides the encoding, UTF-8 otherwise), or null when it holds more than <paramref name="maxBytes"/> bytes.</summary>
    public static string? ReadText(string path, int maxBytes)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(maxBytes);
        var buffer = new byte[maxBytes + 1];
        var filled = 0;
        using (var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite, bufferSize: 1, FileOptions.SequentialScan))
        {
            int read;
            while (filled < buffer.Length && (read = stream.Read(buffer, filled, buffer.Length - filled)) > 0)
            {
                filled += read;
            }
        }

        if (filled > maxBytes)
        {
            return null;
        }

        // The same detection File.ReadAllText applies: a byte-order mark wins, UTF-8 otherwise.
        using var reader = new StreamReader(new MemoryStream(buffer, 0, filled, writable: false), Encoding.UTF8, detectEncodingFromByteOrderMarks: true);
        return reader.ReadToEnd();
    }
}
