using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary>The outcome of reading a configuration: a config when there is no error, otherwise every error found.</summary>
internal sealed record ConfigLoadResult(DriftWatchConfig? Config, IReadOnlyList<ConfigError> Errors)
{
    public bool Ok => Errors.Count == 0 && Config is not null;

    /// <summary>Offline loading only: "key: why" for each secret that was not available and so not checked.</summary>
    public IReadOnlyList<string> NotChecked { get; init; } = [];
}
