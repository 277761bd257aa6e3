using DriftWatch.Cli;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Output;

namespace DriftWatch.Tests.Output;

public sealed class ProfileViewTests
{
    private static string Render(ProfileReport report)
    {
        using var output = new StringWriter();
        using var error = new StringWriter();
        var console = CliConsole.ForWriters(output, error);
        ProfileView.Render(console.Ansi, report);
        return output.ToString();
    }

    private static readonly RelationshipProfile Current = new()
    {
        NRows = 12_345,
        NUsed = 12_300,
        NNull = 45,
        PearsonR = 0.999999,
        PearsonCiLow = 0.99999,
        PearsonCiHigh = 1,
        Slope = 118,
        Shape = Shape.Perfect,
        ExactAffine = true,
        Equation = "y = 0 + 118 x",
    };

    private static readonly RelationshipProfile Baseline = new() { NRows = 112, NUsed = 112, PearsonR = 0.9645, Shape = Shape.Linear };

    [Fact]
    public void Render_Comparison_PlainTextWithBothColumnsFindingsAndCaution()
    {
        var finding = new Finding(FindingKind.BecamePerfect, Severity.Critical, null, 0.0355, "loaves_baked became an exact function of oven_hours.");
        var report = new ProfileReport(Current, Baseline, [finding], new ProfileLabels("oven_hours", "loaves_baked", "now.csv", "then.csv"));

        var text = Render(report);
        var lines = text.Split('\n');

        Assert.DoesNotContain('\u001b', text); // no ANSI escape codes in redirected output
        Assert.Contains("baseline: then.csv", text, StringComparison.Ordinal);
        var rows = Assert.Single(lines, l => l.Contains("rows read", StringComparison.Ordinal));
        Assert.Contains("12,345", rows, StringComparison.Ordinal);
        Assert.Contains("112", rows, StringComparison.Ordinal);
        Assert.Contains(lines, l => l.Contains("Pearson r [CI]", StringComparison.Ordinal) && l.Contains("1.000 [1.000, 1.000]", StringComparison.Ordinal) && l.Contains("0.9645", StringComparison.Ordinal));
        Assert.Contains(lines, l => l.Contains("CRITICAL", StringComparison.Ordinal) && l.Contains("became_perfect", StringComparison.Ordinal) && l.Contains("(effect 0.03550)", StringComparison.Ordinal));
        Assert.Contains("loaves_baked became an exact function of oven_hours.", text, StringComparison.Ordinal);
        Assert.Equal(Cautions.SignalsNotProof, lines.Last(l => l.Length > 0).Trim());
    }

    [Fact]
    public void Render_SingleProfileNoFindings_NoBaselineColumn()
    {
        var report = new ProfileReport(Baseline, null, [], new ProfileLabels("x", "y", "a.csv", null));

        var text = Render(report);

        Assert.DoesNotContain("baseline", text, StringComparison.Ordinal);
        Assert.Contains("No findings.", text, StringComparison.Ordinal);
        Assert.Contains(Cautions.SignalsNotProof, text, StringComparison.Ordinal);
    }
}
