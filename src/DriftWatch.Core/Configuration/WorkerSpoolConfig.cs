namespace DriftWatch.Core.Configuration;

/// <summary>
/// <c>worker.spool</c>: where the worker keeps finished runs while the store cannot take them, and the start markers
/// of running checks; how much it keeps before it refuses runs (loudly).
/// </summary>
public sealed record WorkerSpoolConfig
{
    /// <summary>The folder beside the configuration file when <see cref="Path"/> is not set.</summary>
    public const string DefaultFolderName = "driftwatch-spool";

    /// <summary>Days of hourly checks of a hundred pairs.</summary>
    public const int DefaultMaxRuns = 10_000;

    /// <summary>256 MiB: room for the default number of runs with their sampled points.</summary>
    public const long DefaultMaxBytes = 256L * 1024 * 1024;

    /// <summary>An absolute folder (relative ones are resolved against the configuration file's folder); null: the default beside the file.</summary>
    public string? Path { get; init; }

    public int MaxRuns { get; init; } = DefaultMaxRuns;

    public long MaxBytes { get; init; } = DefaultMaxBytes;

    /// <summary>The folder for a configuration read from <paramref name="configFile"/> (the current folder without one).</summary>
    public string FolderFor(string? configFile) =>
        Path ?? System.IO.Path.Combine(System.IO.Path.GetDirectoryName(configFile) is { Length: > 0 } dir ? dir : ".", DefaultFolderName);
}
