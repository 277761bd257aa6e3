namespace DriftWatch.Core.Configuration;

public enum StoreKind
{
    Sqlite,
    Postgres,
}

/// <summary>Where DriftWatch keeps its own history (runs, profiles, findings, baselines, alerts, outbox).</summary>
public sealed record StoreConfig
{
    public const string DefaultSqlitePath = "data/driftwatch.db";
    public const int DefaultPointsPerRun = 1000;
    public static readonly TimeSpan DefaultRetention = TimeSpan.FromDays(180);
    public static readonly TimeSpan DefaultPointsRetention = TimeSpan.FromDays(35);

    public StoreKind Kind { get; init; } = StoreKind.Sqlite;

    /// <summary>For SQLite a connection string or "Data Source=path"; resolved; a secret for PostgreSQL.</summary>
    public string ConnectionString { get; init; } = $"Data Source={DefaultSqlitePath}";

    /// <summary>Runs older than this are deleted (with their profiles and findings).</summary>
    public TimeSpan Retention { get; init; } = DefaultRetention;

    /// <summary>How many sampled points each run keeps for plots, baselines and the KS test.</summary>
    public int PointsPerRun { get; init; } = DefaultPointsPerRun;

    /// <summary>Sampled points of runs older than this are dropped (the run row stays). Must cover a rolling baseline.</summary>
    public TimeSpan PointsRetention { get; init; } = DefaultPointsRetention;

    public override string ToString() => Kind.ToString();
}
