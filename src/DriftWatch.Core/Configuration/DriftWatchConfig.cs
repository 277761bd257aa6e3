namespace DriftWatch.Core.Configuration;

/// <summary>The whole, validated configuration. Built by the YAML loader; pairs carry their effective settings.</summary>
public sealed record DriftWatchConfig
{
    /// <summary>The file it was read from, for messages; null when built in code.</summary>
    public string? FilePath { get; init; }

    public IReadOnlyList<SourceConfig> Sources { get; init; } = [];

    public StoreConfig Store { get; init; } = new();

    public IReadOnlyList<PairConfig> Pairs { get; init; } = [];

    public AlertingConfig Alerting { get; init; } = new();

    public DashboardConfig Dashboard { get; init; } = new();

    public LoggingConfig Logging { get; init; } = new();

    public WorkerConfig Worker { get; init; } = new();

    public SourceConfig? FindSource(string name) =>
        Sources.FirstOrDefault(s => string.Equals(s.Name, name, StringComparison.Ordinal));

    public PairConfig? FindPair(string name) =>
        Pairs.FirstOrDefault(p => string.Equals(p.Name, name, StringComparison.Ordinal));
}
