namespace DriftWatch.Core.Configuration;

public enum SourceKind
{
    Postgres,
    Sqlite,
    DuckDb,
    MySql,
}

/// <summary>A named, read-only connection to the data being watched.</summary>
public sealed record SourceConfig
{
    public const int DefaultMaxConcurrentQueries = 2;
    public static readonly TimeSpan DefaultStatementTimeout = TimeSpan.FromSeconds(60);

    public required string Name { get; init; }

    public required SourceKind Kind { get; init; }

    /// <summary>Resolved connection string (environment expanded, password file applied). A secret: never log it.</summary>
    public required string ConnectionString { get; init; }

    /// <summary>Where relative file paths of a duckdb source's pairs resolve (the configuration file's directory); null: the working directory.</summary>
    public string? BaseDirectory { get; init; }

    public int MaxConcurrentQueries { get; init; } = DefaultMaxConcurrentQueries;

    public TimeSpan StatementTimeout { get; init; } = DefaultStatementTimeout;

    /// <summary>Never prints the connection string.</summary>
    public override string ToString() => $"{Name} ({Kind})";
}
