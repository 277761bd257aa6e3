using DriftWatch.Configuration;

namespace DriftWatch.Tests.Configuration;

/// <summary>Parses YAML written in a test with a dictionary for the environment.</summary>
internal static class ConfigText
{
    public const string File = "test.yaml";

    public static ConfigLoadResult Parse(string yaml, IReadOnlyDictionary<string, string>? env = null, string? baseDirectory = null) =>
        ConfigLoader.Parse(yaml, File, name => env is not null && env.TryGetValue(name, out var value) ? value : null, baseDirectory ?? BaseDirectory);

    /// <summary>A fixed, absolute base so resolved paths can be asserted.</summary>
    public static string BaseDirectory { get; } = Path.Combine(Path.GetTempPath(), "driftwatch-config-tests");

    /// <summary>The smallest valid head: a sqlite source named "shop"; append pairs or sections.</summary>
    public const string SqliteSource = """
        sources:
          - name: shop
            kind: sqlite
            connection: shop.db
        """;

    public static string[] Lines(ConfigLoadResult result) => [.. result.Errors.Select(e => e.ToString())];

    /// <summary>The only error, asserted to be the only one.</summary>
    public static ConfigError Single(ConfigLoadResult result)
    {
        Assert.False(result.Ok);
        Assert.Null(result.Config);
        return Assert.Single(result.Errors);
    }
}
