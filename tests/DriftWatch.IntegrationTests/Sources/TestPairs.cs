using DriftWatch.Core.Configuration;

namespace DriftWatch.IntegrationTests.Sources;

internal static class TestPairs
{
    /// <summary>The check time of the source tests: the day after the generated readings start.</summary>
    public static readonly DateTimeOffset Now = new(2026, 3, 2, 0, 0, 0, TimeSpan.Zero);

    public static SourceConfig PgSource(string connectionString, TimeSpan? timeout = null) => new()
    {
        Name = "warehouse",
        Kind = SourceKind.Postgres,
        ConnectionString = connectionString,
        StatementTimeout = timeout ?? SourceConfig.DefaultStatementTimeout,
    };

    public static SourceConfig SqliteSource(string path, TimeSpan? timeout = null) => new()
    {
        Name = "local",
        Kind = SourceKind.Sqlite,
        ConnectionString = $"Data Source={path}",
        StatementTimeout = timeout ?? SourceConfig.DefaultStatementTimeout,
    };

    public static PairConfig Table(string table, string x = "x", string y = "y", SampleSpec? sample = null, WindowSpec? window = null, string? where = null) => new()
    {
        Name = "readings.x_vs_y",
        Source = "warehouse",
        Table = table,
        X = x,
        Y = y,
        Sample = sample ?? new SampleSpec(),
        Window = window,
        Where = where,
    };

    public static PairConfig Query(string query, string x = "x", string y = "y", SampleSpec? sample = null, WindowSpec? window = null) => new()
    {
        Name = "readings.query",
        Source = "warehouse",
        Query = query,
        X = x,
        Y = y,
        Sample = sample ?? new SampleSpec(),
        Window = window,
    };
}
