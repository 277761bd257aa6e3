namespace DriftWatch.Tests;

/// <summary>Paths of the files under Data/, copied next to the test assembly by the build.</summary>
internal static class TestData
{
    public static string Path(params string[] parts) =>
        System.IO.Path.Combine([AppContext.BaseDirectory, "Data", .. parts]);
}
