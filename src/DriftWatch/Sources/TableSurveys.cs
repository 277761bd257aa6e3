using DriftWatch.Core.Configuration;
using DriftWatch.Sources.DuckDb;
using DriftWatch.Sources.MySql;
using DriftWatch.Sources.Postgres;
using DriftWatch.Sources.Sqlite;

namespace DriftWatch.Sources;

/// <summary>The one place a source kind gets its <see cref="ITableSurvey"/>.</summary>
internal static class TableSurveys
{
    /// <exception cref="NotSupportedException">The kind has no survey yet; the message names it.</exception>
    public static ITableSurvey Create(SourceConfig source)
    {
        ArgumentNullException.ThrowIfNull(source);
        return source.Kind switch
        {
            SourceKind.Postgres => new PostgresTableSurvey(source),
            SourceKind.Sqlite => new SqliteTableSurvey(source),
            SourceKind.DuckDb => new DuckDbTableSurvey(source),
            SourceKind.MySql => new MySqlTableSurvey(source),
            _ => throw new NotSupportedException(
                $"discover is not supported for kind {source.Kind.ToString().ToLowerInvariant()} yet (source '{source.Name}'); it reads postgres, sqlite, duckdb and mysql sources."),
        };
    }
}
