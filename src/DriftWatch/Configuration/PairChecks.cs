using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary>Checks of a pair's effective settings against its source and the store, after defaults are applied.</summary>
internal static class PairChecks
{
    public static void Check(MappingReader reader, PairConfig pair, IReadOnlyList<SourceConfig> sources, StoreConfig store)
    {
        var source = sources.FirstOrDefault(s => string.Equals(s.Name, pair.Source, StringComparison.Ordinal));
        if (source is not null && source.Kind != SourceKind.DuckDb && Sources.DuckDb.DuckDbTarget.IsFile(pair.Table))
        {
            reader.Error("table", $"'{pair.Table}' names files; only a duckdb source reads Parquet or CSV files ('{source.Name}' is {source.Kind.ToString().ToLowerInvariant()})");
        }

        if (pair.Sample.Method == SampleMethod.Tablesample)
        {
            var origin = reader.Has("sample") ? "" : " (the method comes from defaults.sample)";
            if (pair.Query is not null)
            {
                reader.Error("sample", $"method tablesample samples a table; a pair with a query needs auto, random or all{origin}");
            }
            else if (source is { Kind: SourceKind.Sqlite or SourceKind.MySql })
            {
                var kind = source.Kind == SourceKind.Sqlite ? "sqlite" : "mysql";
                reader.Error("sample", $"method tablesample needs a postgres or duckdb source; '{source.Name}' is {kind}{origin}");
            }
        }

        if (pair.Sample.Method != SampleMethod.All && pair.Thresholds.MinUsableRows > pair.Sample.Rows)
        {
            // Every check would read fewer rows than it needs and end unmeasurable: a setting that can never work.
            var where = reader.Has("thresholds") ? "thresholds" : "name";
            reader.Error(where,
                $"thresholds.min_usable_rows ({pair.Thresholds.MinUsableRows}) is more than sample.rows ({pair.Sample.Rows}); every check would be unmeasurable");
        }

        if (pair.Baseline.Kind == BaselinePolicyKind.Rolling && pair.Baseline.RollingPeriod > store.PointsRetention)
        {
            var where = reader.Has("baseline") ? "baseline" : "name";
            reader.Error(where,
                $"a rolling baseline of {DurationSyntax.Format(pair.Baseline.RollingPeriod)} is longer than store.points_retention ({DurationSyntax.Format(store.PointsRetention)}); the points it pools would already be deleted");
        }
    }
}
