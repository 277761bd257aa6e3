using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary><c>store:</c> where DriftWatch keeps its own history.</summary>
internal static class StoreSection
{
    public const int MinPointsPerRun = 10;
    public const int MaxPointsPerRun = 100_000;
    public static readonly TimeSpan MaxRetention = TimeSpan.FromDays(3650);

    public static StoreConfig Read(ConfigContext context, MappingReader? reader)
    {
        var defaults = new StoreConfig();
        if (reader is null)
        {
            // The default file resolves like a written one: next to the configuration.
            return defaults with
            {
                ConnectionString = ConnectionStrings.Sqlite(StoreConfig.DefaultSqlitePath, context.BaseDirectory, out _)!,
            };
        }

        var kind = reader.Choice("kind", ("sqlite", StoreKind.Sqlite), ("postgres", StoreKind.Postgres)) ?? defaults.Kind;
        var connection = ConnectionSection.Read(reader, kind == StoreKind.Postgres, StoreConfig.DefaultSqlitePath);
        var retention = reader.Duration("retention", TimeSpan.FromDays(1), MaxRetention) ?? defaults.Retention;
        var pointsPerRun = reader.Int("points_per_run", MinPointsPerRun, MaxPointsPerRun) ?? defaults.PointsPerRun;
        var pointsRetention = reader.Duration("points_retention", TimeSpan.FromDays(1), MaxRetention) ?? defaults.PointsRetention;
        reader.Done();
        if (pointsRetention > retention)
        {
            reader.Error("points_retention", $"({DurationSyntax.Format(pointsRetention)}) cannot be longer than store.retention ({DurationSyntax.Format(retention)}): the runs the points belong to are deleted first");
        }

        return defaults with
        {
            Kind = kind,
            ConnectionString = connection ?? defaults.ConnectionString,
            Retention = retention,
            PointsPerRun = pointsPerRun,
            PointsRetention = pointsRetention,
        };
    }
}
