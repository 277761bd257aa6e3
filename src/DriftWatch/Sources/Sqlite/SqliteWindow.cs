using System.Globalization;

namespace DriftWatch.Sources.Sqlite;

/// <summary>
/// SQLite has no time type. A window column holds either Unix seconds (integer or real) or ISO-8601 UTC text
/// ("2026-03-01 12:00:00", "2026-03-01T12:00:00Z", "2026-03-01"). The bounds are written in the column's own
/// form, read from its first non-null value, and compared directly, so an index on the column is used.
/// Text compares as text: values must be UTC and share one layout; other offsets are not converted.
/// </summary>
/// <param name="EndInclusive">(From, To] instead of [From, To) (see <see cref="WindowRange"/>).</param>
/// <param name="End">Where the window ends, as a time; null when anchor latest found no value.</param>
internal sealed record SqliteWindow(object From, object To, bool EndInclusive = false, DateTimeOffset? End = null)
{
    public static SqliteWindow For(string storageClass, string? firstValue, DateTimeOffset from, DateTimeOffset to)
    {
        if (IsNumber(storageClass))
        {
            return new SqliteWindow(from.ToUnixTimeMilliseconds() / 1000.0, to.ToUnixTimeMilliseconds() / 1000.0, End: to);
        }

        var format = FormatOf(firstValue);
        return new SqliteWindow(
            from.UtcDateTime.ToString(format, CultureInfo.InvariantCulture),
            to.UtcDateTime.ToString(format, CultureInfo.InvariantCulture),
            End: to);
    }

    /// <summary>
    /// (newest − last, newest] for the newest stored value as it is stored: the upper bound is that value itself, so
    /// its rows are in whatever precision the column has.
    /// </summary>
    public static SqliteWindow Through(string storageClass, string? firstValue, object newest, TimeSpan last)
    {
        ArgumentNullException.ThrowIfNull(newest);
        if (IsNumber(storageClass))
        {
            var seconds = Convert.ToDouble(newest, CultureInfo.InvariantCulture);
            var end = DateTimeOffset.FromUnixTimeMilliseconds((long)Math.Round(seconds * 1000));
            return new SqliteWindow(seconds - last.TotalSeconds, newest, EndInclusive: true, End: end);
        }

        var text = Convert.ToString(newest, CultureInfo.InvariantCulture)!;
        var at = DateTimeOffset.Parse(text, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal);
        return new SqliteWindow((at - last).UtcDateTime.ToString(FormatOf(firstValue), CultureInfo.InvariantCulture), text, EndInclusive: true, End: at);
    }

    private static bool IsNumber(string storageClass) => storageClass is "integer" or "real";

    private static string FormatOf(string? firstValue) => firstValue switch
    {
        { Length: 10 } => "yyyy-MM-dd",
        { Length: > 10 } v when v[10] == 'T' => "yyyy-MM-dd'T'HH:mm:ss",
        _ => "yyyy-MM-dd HH:mm:ss",
    };
}
