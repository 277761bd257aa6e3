using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary><c>sources:</c> named, read-only connections to the watched data.</summary>
internal static class SourcesSection
{
    public const int MaxConcurrentQueriesLimit = 64;
    public static readonly TimeSpan MaxStatementTimeout = TimeSpan.FromHours(24);

    public static readonly (string Name, SourceKind Value)[] Kinds = [("postgres", SourceKind.Postgres), ("sqlite", SourceKind.Sqlite), ("duckdb", SourceKind.DuckDb), ("mysql", SourceKind.MySql)];

    public static IReadOnlyList<SourceConfig> Read(MappingReader root, out IReadOnlySet<string> declared)
    {
        var sources = new List<SourceConfig>();
        var seen = new Dictionary<string, long>(StringComparer.Ordinal);
        foreach (var (node, path) in root.Items("sources"))
        {
            var reader = MappingReader.OpenItem(root.Context, node, path, ConfigKeys.Source, "a source needs name, kind and connection");
            if (reader is null)
            {
                continue;
            }

            var name = NameSection.Read(reader, "source", seen);
            var kind = reader.Choice("kind", Kinds);
            if (kind is null && !reader.Has("kind"))
            {
                reader.Missing("kind", "is required: postgres, sqlite, duckdb or mysql");
            }

            var connection = kind is null ? null : ConnectionSection.Read(reader, kind.Value, sqliteDefault: null);
            if (kind is null)
            {
                // Still mark them read; without a kind they cannot be checked.
                _ = reader.Node("connection");
                _ = reader.Node("password_file");
            }

            var maxQueries = reader.Int("max_concurrent_queries", 1, MaxConcurrentQueriesLimit);
            var timeout = reader.Duration("statement_timeout", TimeSpan.FromSeconds(1), MaxStatementTimeout);
            reader.Done();
            if (name is null || kind is null || connection is null)
            {
                continue;
            }

            sources.Add(new SourceConfig
            {
                Name = name,
                Kind = kind.Value,
                ConnectionString = connection,
                BaseDirectory = reader.Context.BaseDirectory,
                MaxConcurrentQueries = maxQueries ?? SourceConfig.DefaultMaxConcurrentQueries,
                StatementTimeout = timeout ?? SourceConfig.DefaultStatementTimeout,
            });
        }

        // Names of sources with other errors count as declared, so pairs do not report them again as unknown.
        declared = seen.Keys.ToHashSet(StringComparer.Ordinal);
        return sources;
    }
}
