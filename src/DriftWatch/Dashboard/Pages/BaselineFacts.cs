using DriftWatch.Dashboard.Data;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>The baseline the pair is compared with: which policy made it, when, from what, and its main figures.</summary>
internal static class BaselineFacts
{
    public static void Render(Html html, PairSummary summary)
    {
        ArgumentNullException.ThrowIfNull(html);
        ArgumentNullException.ThrowIfNull(summary);
        html.Open("section", ("class", "card"), ("aria-labelledby", "baseline-title"), ("id", "baseline"));
        html.Element("h2", "Baseline", ("id", "baseline-title"));
        if (summary.Baseline is not { } baseline)
        {
            var policy = summary.Config?.Baseline.ToString();
            html.Element("p", policy is null
                ? "No baseline is stored for this pair."
                : $"No baseline yet: the policy ({policy}) has not collected enough successful runs. Findings about a single profile still apply.",
                ("class", "muted"));
            html.Close("section");
            return;
        }

        var profile = baseline.Profile;
        html.Open("dl", ("class", "facts-list"));
        Fact(html, "Policy", baseline.PolicyText + (baseline.Accepted ? " (accepted by hand)" : string.Empty));
        Fact(html, "Built", Display.Time(baseline.CreatedAt));
        Fact(html, "Covers", $"{Display.Time(baseline.CoversFrom)} to {Display.Time(baseline.CoversTo)}");
        Fact(html, "Pooled from", $"{Figures.Count(baseline.RunCount)} runs, {Figures.Count(baseline.Points.UsedCount)} points kept" +
            (baseline.MeanRunUsed is { } perRun ? $", about {Figures.Count((int)Math.Round(perRun))} usable rows per run" : string.Empty));
        Fact(html, "Pearson r", Readable.WithInterval(profile.PearsonR, profile.PearsonCiLow, profile.PearsonCiHigh) + " (95% CI)");
        Fact(html, "Spearman ρ · Kendall τ-b", $"{Figures.Correlation(profile.SpearmanRho)} · {Figures.Correlation(profile.KendallTauB)}");
        Fact(html, "Line", profile.Intercept is null || profile.Slope is null ? Figures.Missing : $"y = {Figures.Number(profile.Intercept)} + {Figures.Number(profile.Slope)}·x");
        Fact(html, "Outliers · nulls", $"{Figures.Percent(profile.OutlierRate)} · {Figures.Percent(profile.NRows == 0 ? null : (double)profile.NNull / profile.NRows)}");
        Fact(html, "Shape", JsonContract.Name(profile.Shape).Replace('_', ' '));
        html.Close("dl");
        html.Close("section");
    }

    internal static void Fact(Html html, string term, string? value)
    {
        html.Element("dt", term);
        html.Element("dd", string.IsNullOrEmpty(value) ? Figures.Missing : value);
    }
}
