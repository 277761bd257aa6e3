using System.Globalization;

namespace DriftWatch.Sources.Sqlite;

/// <summary>
/// SQLite has no time type. A window column holds either Unix seconds (integer or real) or ISO-8601 UTC text
/// ("2026-03-01 12:00:00", "2026-03-01T12:00:00Z", "2026-03-01"). The bounds are written in the column's own
/// form, read from its first non-null value, and compared directly, so an index on the column is used.
/// Text compares as text: values must be UTC and share one layout; other offsets are not converted.
/// </summary>
internal sealed record SqliteWindow(object From, object To)
{
    public static SqliteWindow For(string storageClass, string? firstValue, DateTimeOffset from, DateTimeOffset to)
    {
        if (storageClass is "integer" or "real")
        {
            return new SqliteWindow(from.ToUnixTimeMilliseconds() / 1000.0, to.ToUnixTimeMilliseconds() / 1000.0);
        }

        var format = firstValue switch
        {
            { Length: 10 } => "yyyy-MM-dd",
            { Length: > 10 } v when v[10] == 'T' => "yyyy-MM-dd'T'HH:mm:ss",
            _ => "yyyy-MM-dd HH:mm:ss",
        };
        return new SqliteWindow(
            from.UtcDateTime.ToString(format, CultureInfo.InvariantCulture),
            to.UtcDateTime.ToString(format, CultureInfo.InvariantCulture));
    }
}
