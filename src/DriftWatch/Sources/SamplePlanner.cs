using System.Globalization;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Sources;

internal enum SampleDraw
{
    All,
    Random,
    Tablesample,
}

/// <param name="Percent">For <see cref="SampleDraw.Tablesample"/>: the percentage of the table's blocks (or rows) to read.</param>
/// <param name="Note">Why the configured method was not used, when it was not.</param>
internal sealed record SamplePlan(SampleDraw Draw, double? Percent = null, string? Note = null);

/// <summary>
/// Chooses how to draw a pair's sample once the exact number of rows in the window is known (the push-down
/// aggregate counts them first).
/// </summary>
/// <remarks>
/// Table sampling reads <c>p</c>% of the whole table and then applies the window and filter, so the expected
/// yield is <c>p</c>% of the window's rows whatever the table's size: <c>p = 100 · 1.5 · rows / windowRows</c>
/// (the 1.5 covers the variance of block sampling; the surplus is cut by <c>ORDER BY random() LIMIT rows</c>).
/// Its cost, though, is <c>p</c>% of the table: under <see cref="SampleMethod.Auto"/> it is chosen only when that
/// reads fewer rows than scanning the window for <c>ORDER BY random()</c> would.
/// </remarks>
internal static class SamplePlanner
{
    public const double Oversampling = 1.5;

    /// <param name="windowRows">Exact rows in the window (after the filter).</param>
    /// <param name="tableRows">The table's estimated rows (pg_class.reltuples, ≤ 0 when never analysed); null when table sampling is impossible (a query, a view, SQLite).</param>
    /// <param name="filtered">A window or filter restricts the table, so window rows and table rows differ.</param>
    public static SamplePlan Choose(SampleSpec spec, long windowRows, double? tableRows, bool filtered)
    {
        ArgumentNullException.ThrowIfNull(spec);
        if (spec.Method == SampleMethod.All || windowRows <= spec.Rows)
        {
            return new SamplePlan(SampleDraw.All);
        }

        if (spec.Method == SampleMethod.Auto && windowRows < spec.AllRowsBelow)
        {
            return new SamplePlan(SampleDraw.All);
        }

        if (spec.Method == SampleMethod.Random)
        {
            return new SamplePlan(SampleDraw.Random);
        }

        var percent = Math.Min(100.0, 100.0 * Oversampling * spec.Rows / windowRows);
        if (tableRows is null)
        {
            return new SamplePlan(SampleDraw.Random, Note: spec.Method == SampleMethod.Tablesample ? "table sampling needs a table" : null);
        }

        if (spec.Method == SampleMethod.Tablesample)
        {
            return new SamplePlan(SampleDraw.Tablesample, percent);
        }

        // Auto on a large window: never-analysed tables (reltuples ≤ 0) are as large as the window when nothing filters them.
        var table = tableRows.Value > 0 ? Math.Max(tableRows.Value, windowRows) : filtered ? (double?)null : windowRows;
        return table is { } t && percent / 100.0 * t < windowRows
            ? new SamplePlan(SampleDraw.Tablesample, percent)
            : new SamplePlan(SampleDraw.Random);
    }

    public static string FormatPercent(double percent) => percent.ToString("0.####", CultureInfo.InvariantCulture);
}
