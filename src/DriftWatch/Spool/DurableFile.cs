namespace DriftWatch.Spool;

/// <summary>
/// Writes a small file so that after a crash it is either whole or absent under its final name: the bytes go to
/// <c>name.tmp</c>, are flushed to the disk (fsync), and the file is then renamed. A <c>.tmp</c> left by a crash
/// in between is whole (it was synced before the rename) or truncated; <see cref="RunSpool"/> tells them apart by
/// parsing it. .NET cannot open a directory to fsync it, so a rename lost with the directory's metadata leaves the
/// synced <c>.tmp</c>, which the next start picks up.
/// </summary>
internal static class DurableFile
{
    public const string TempSuffix = ".tmp";

    public static void Write(string path, byte[] content)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(content);
        var temp = path + TempSuffix;
        using (var stream = new FileStream(temp, FileMode.Create, FileAccess.Write, FileShare.None, 4096, FileOptions.WriteThrough))
        {
            stream.Write(content);
            stream.Flush(flushToDisk: true);
        }

        File.Move(temp, path, overwrite: true);
    }
}
