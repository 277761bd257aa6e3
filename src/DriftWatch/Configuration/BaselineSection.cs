using System.Globalization;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary>
/// <c>baseline:</c> exactly one of <c>first_runs: 5</c>, <c>window: {from, to}</c> or <c>rolling: 30d</c>.
/// A pair's baseline replaces the default's as a whole: the three kinds do not mix.
/// </summary>
internal static class BaselineSection
{
    public const int MaxFirstRuns = 1000;
    public static readonly TimeSpan MaxRolling = TimeSpan.FromDays(3650);

    private static readonly string[] DateFormats =
    [
        "yyyy-MM-dd'T'HH:mm:ssK",
        "yyyy-MM-dd'T'HH:mm:ss",
        "yyyy-MM-dd'T'HH:mmK",
        "yyyy-MM-dd'T'HH:mm",
        "yyyy-MM-dd HH:mm:ssK",
        "yyyy-MM-dd HH:mm:ss",
    ];

    /// <summary>The policy, or null when absent or wrong (reported).</summary>
    public static BaselinePolicy? Read(MappingReader? reader)
    {
        if (reader is null)
        {
            return null;
        }

        var given = ConfigKeys.Baseline.Keys.Where(reader.Has).ToList();
        BaselinePolicy? result = null;
        if (given.Count != 1)
        {
            var what = given.Count == 0 ? "none is given" : $"{string.Join(" and ", given)} are given";
            reader.Context.Error(reader.Start, reader.Path, $"needs exactly one of first_runs, window or rolling; {what}");
        }
        else if (given[0] == "first_runs")
        {
            if (reader.Int("first_runs", 1, MaxFirstRuns) is { } runs)
            {
                result = new BaselinePolicy { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = runs };
            }
        }
        else if (given[0] == "rolling")
        {
            if (reader.Duration("rolling", TimeSpan.FromHours(1), MaxRolling) is { } period)
            {
                result = new BaselinePolicy { Kind = BaselinePolicyKind.Rolling, RollingPeriod = period };
            }
        }
        else
        {
            result = ReadWindow(reader.Mapping("window", ConfigKeys.BaselineWindow));
        }

        // Mark the others read: their presence is already the error above.
        foreach (var key in ConfigKeys.Baseline.Keys)
        {
            _ = reader.Node(key);
        }

        reader.Done();
        return result;
    }

    private static BaselinePolicy? ReadWindow(MappingReader? window)
    {
        if (window is null)
        {
            return null;
        }

        var from = Date(window, "from", endOfDay: false);
        var to = Date(window, "to", endOfDay: true);
        window.Done();
        if (from is null || to is null)
        {
            return null;
        }

        if (from >= to)
        {
            window.Error("to", $"must be after from ({from:yyyy-MM-dd}), was {to:yyyy-MM-dd}");
            return null;
        }

        return new BaselinePolicy { Kind = BaselinePolicyKind.Window, From = from, To = to };
    }

    /// <summary>A date alone means the whole day in UTC: <c>from</c> its first instant, <c>to</c> its last, so both ends count.</summary>
    private static DateTimeOffset? Date(MappingReader reader, string key, bool endOfDay)
    {
        if (!reader.Has(key))
        {
            _ = reader.Node(key);
            reader.Missing(key, "is required: a date (2026-01-31) or a time (2026-01-31T18:00:00Z)");
            return null;
        }

        var text = reader.Text(key);
        if (text is null)
        {
            return null;
        }

        if (DateOnly.TryParseExact(text, "yyyy-MM-dd", CultureInfo.InvariantCulture, DateTimeStyles.None, out var day))
        {
            var start = new DateTimeOffset(day.ToDateTime(TimeOnly.MinValue), TimeSpan.Zero);
            return endOfDay ? start.AddDays(1).AddTicks(-1) : start;
        }

        if (DateTimeOffset.TryParseExact(text, DateFormats, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal, out var time))
        {
            return time;
        }

        reader.Error(key, $"must be a date (2026-01-31) or a time (2026-01-31T18:00:00Z), was '{text}'");
        return null;
    }
}
