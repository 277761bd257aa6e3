namespace DriftWatch.Core.Configuration;

public enum LogFormat
{
    Text,
    Json,
}

public sealed record LoggingConfig
{
    public LogFormat Format { get; init; } = LogFormat.Text;

    /// <summary>Optional rolling log file path.</summary>
    public string? File { get; init; }

    public string MinimumLevel { get; init; } = "Information";
}
