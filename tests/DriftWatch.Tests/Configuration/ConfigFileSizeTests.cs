using DriftWatch.Configuration;

namespace DriftWatch.Tests.Configuration;

/// <summary>
/// The size limit holds while reading, not after: a file's reported length is not trusted. /dev/zero (a Linux
/// character device of endless zero bytes that reports a length of 0; common practice) is the case that grew
/// without bound before.
/// </summary>
public sealed class ConfigFileSizeTests
{
    private const string Zero = "/dev/zero";

    private static string TooLarge(string path) =>
        $"the file is larger than {ConfigLoader.MaxFileBytes} bytes (1 MiB), the most a configuration may have; reading stopped there";

    [Fact]
    public void Load_DevZero_StopsAtTheLimitWithOneErrorNamingFileAndLimit()
    {
        var before = GC.GetAllocatedBytesForCurrentThread();
        var result = ConfigLoader.Load(Zero, _ => null);
        var allocated = GC.GetAllocatedBytesForCurrentThread() - before;

        var error = ConfigText.Single(result);
        Assert.Equal(Zero, error.File);
        Assert.Equal(TooLarge(Zero), error.Message);
        // The bounded read holds one buffer of limit + 1 bytes; reading on would allocate without end.
        Assert.InRange(allocated, 0, 4L * ConfigLoader.MaxFileBytes);
    }

    [Fact]
    public void Load_LargeFile_ReadsNoFurtherThanTheLimit()
    {
        using var dir = new TempDirectory();
        var path = Path.Combine(dir.Path, "huge.yaml");
        using (var file = File.Create(path))
        {
            // 64 MiB of zero bytes (sparse on most file systems, so the test stays cheap).
            file.SetLength(64L * ConfigLoader.MaxFileBytes);
        }

        var before = GC.GetAllocatedBytesForCurrentThread();
        var result = ConfigLoader.Load(path, _ => null);
        var allocated = GC.GetAllocatedBytesForCurrentThread() - before;

        var error = ConfigText.Single(result);
        Assert.Equal(path, error.File);
        Assert.Equal(TooLarge(path), error.Message);
        Assert.InRange(allocated, 0, 4L * ConfigLoader.MaxFileBytes);
    }

    [Fact]
    public void Load_OneByteOverTheLimit_IsRefused()
    {
        using var dir = new TempDirectory();
        var path = dir.Write("over.yaml", "#" + new string('x', ConfigLoader.MaxFileBytes));
        Assert.Equal(TooLarge(path), ConfigText.Single(ConfigLoader.Load(path, _ => null)).Message);
    }

    [Fact]
    public void Load_ExactlyAtTheLimit_IsReadAndParsed()
    {
        using var dir = new TempDirectory();
        // A comment line of exactly the limit: read in full, then refused for what it says, not for its size.
        var path = dir.Write("full.yaml", "#" + new string('x', ConfigLoader.MaxFileBytes - 2) + "\n");
        var error = ConfigText.Single(ConfigLoader.Load(path, _ => null));
        Assert.Equal("the configuration is empty; it needs at least sources and pairs", error.Message);
    }

    [Fact]
    public void SecretFile_DevZero_IsRefusedWithoutReadingOn()
    {
        Assert.Null(SecretFiles.Read(Zero, out var problem));
        Assert.Equal($"'{Zero}' is larger than {SecretFiles.MaxBytes} bytes; that is not a secret file", problem);
    }
}
