using System.Globalization;
using System.Reflection;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Statistics;
using DriftWatch.Dashboard.Data;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>How the pair is checked: where its rows come from, when, what is expected, and every threshold that differs from the default.</summary>
internal static class ConfigFacts
{
    public static void Render(Html html, PairSummary summary)
    {
        ArgumentNullException.ThrowIfNull(html);
        ArgumentNullException.ThrowIfNull(summary);
        html.Open("section", ("class", "card"), ("aria-labelledby", "config-title"), ("id", "config"));
        html.Element("h2", "Configuration", ("id", "config-title"));
        if (summary.Config is not { } pair)
        {
            html.Element("p", "Not in the configuration: no settings to show.", ("class", "muted"));
            html.Close("section");
            return;
        }

        html.Open("dl", ("class", "facts-list"));
        BaselineFacts.Fact(html, "Source", pair.Source);
        if (pair.Table is not null)
        {
            BaselineFacts.Fact(html, "Table", pair.Table + (pair.Where is null ? string.Empty : " where " + pair.Where));
        }

        if (pair.Query is not null)
        {
            html.Element("dt", "Query");
            html.Open("dd").Element("code", pair.Query, ("class", "query")).Close("dd");
        }

        BaselineFacts.Fact(html, "x · y", $"{pair.X} · {pair.Y}");
        if (pair.Window is { } window)
        {
            BaselineFacts.Fact(html, "Window", $"{window.Column} within the last {Span(window.Last)}");
        }

        BaselineFacts.Fact(html, "Schedule", pair.Schedule + " (Quartz cron, seconds first)");
        BaselineFacts.Fact(html, "Sample", Sample(pair.Sample));
        BaselineFacts.Fact(html, "Declared", Declared(pair.Declared));
        BaselineFacts.Fact(html, "Baseline policy", pair.Baseline.ToString());
        if (pair.Tags.Count > 0)
        {
            BaselineFacts.Fact(html, "Tags", string.Join(", ", pair.Tags));
        }

        BaselineFacts.Fact(html, "Mailing lists", pair.Notify.Count == 0 ? "every list whose tags match" : string.Join(", ", pair.Notify));
        var changed = ChangedThresholds(pair.Thresholds);
        BaselineFacts.Fact(html, "Thresholds", changed.Count == 0 ? "all defaults" : string.Join("; ", changed.Select(c => $"{c.Name} {c.Value} (default {c.Default})")));
        html.Close("dl");
        html.Close("section");
    }

    /// <summary>Every threshold whose value differs from <see cref="Thresholds.Default"/>, named as in the YAML (snake_case).</summary>
    public static IReadOnlyList<(string Name, string Value, string Default)> ChangedThresholds(Thresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        // Reflection, so a threshold added later is listed without touching this page.
        return [.. typeof(Thresholds).GetProperties(BindingFlags.Public | BindingFlags.Instance)
            .Where(p => p.PropertyType == typeof(double) && p.CanRead)
            .Select(p => (p.Name, Value: (double)p.GetValue(thresholds)!, Default: (double)p.GetValue(Thresholds.Default)!))
            .Where(t => !t.Value.Equals(t.Default))
            .Select(t => (System.Text.Json.JsonNamingPolicy.SnakeCaseLower.ConvertName(t.Name), Invariant(t.Value), Invariant(t.Default)))];
    }

    private static string Sample(SampleSpec sample)
    {
        var text = $"{JsonContract.Name(sample.Method)}, up to {Figures.Count(sample.Rows)} rows";
        if (sample.Method == SampleMethod.Auto)
        {
            text += $", whole table below {Figures.Count(sample.AllRowsBelow)} rows";
        }

        if (sample.Bernoulli)
        {
            text += ", row-level (Bernoulli)";
        }

        return sample.Seed is { } seed ? text + ", seed " + seed.ToString(CultureInfo.InvariantCulture) : text;
    }

    private static string Declared(PairDeclaration declared)
    {
        var direction = declared.Direction == DeclaredDirection.Any ? "any direction" : JsonContract.Name(declared.Direction) + " relationship";
        return declared.Exact ? direction + ", exact function (a derived column)" : direction;
    }

    private static string Span(TimeSpan span) =>
        span.TotalDays >= 1 && span.TotalDays == Math.Floor(span.TotalDays)
            ? span.TotalDays.ToString("0", CultureInfo.InvariantCulture) + " d"
            : span.TotalHours.ToString("0.##", CultureInfo.InvariantCulture) + " h";

    private static string Invariant(double value) => value.ToString(CultureInfo.InvariantCulture);
}
