using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary><c>sample:</c> read over a starting spec, so a pair's keys merge one by one over the defaults'.</summary>
internal static class SampleSection
{
    public const int MinRows = 10;
    public const int MaxRows = 10_000_000;

    public static SampleSpec Read(MappingReader? reader, SampleSpec start)
    {
        if (reader is null)
        {
            return start;
        }

        var result = start;
        if (reader.Int("rows", MinRows, MaxRows) is { } rows)
        {
            result = result with { Rows = rows };
        }

        if (reader.Choice(
                "method",
                ("auto", SampleMethod.Auto),
                ("tablesample", SampleMethod.Tablesample),
                ("random", SampleMethod.Random),
                ("all", SampleMethod.All)) is { } method)
        {
            result = result with { Method = method };
        }

        if (reader.Long("all_rows_below", 0, long.MaxValue) is { } below)
        {
            result = result with { AllRowsBelow = below };
        }

        if (reader.Bool("bernoulli") is { } bernoulli)
        {
            result = result with { Bernoulli = bernoulli };
        }

        if (reader.Int("seed", int.MinValue, int.MaxValue) is { } seed)
        {
            result = result with { Seed = seed };
        }

        reader.Done();
        return result;
    }
}
