using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Monitoring;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>
/// How one pass of <c>check</c> reads for a CI job, shared by the JUnit and Markdown reports so both count alike:
/// a pair is <i>not measured</i> (its check failed, measured nothing or was cut off), <i>failing</i> (a finding at
/// <see cref="FailAt"/> or worse) or <i>passing</i>.
/// </summary>
internal sealed record CheckTally(IReadOnlyList<PairCheckResult> Results, Severity FailAt, int ExitCode)
{
    public int NotMeasured => Results.Count(IsNotMeasured);

    public int Failing => Results.Count(r => !IsNotMeasured(r) && Failures(r).Count > 0);

    public int Passing => Results.Count - NotMeasured - Failing;

    /// <summary>When the pass began (the earliest check) and how long it took, wall clock, checks overlapping.</summary>
    public DateTimeOffset StartedAt => Results.Count == 0 ? DateTimeOffset.UnixEpoch : Results.Min(r => r.StartedAt);

    public TimeSpan Elapsed => Results.Count == 0 ? TimeSpan.Zero : Results.Max(r => r.FinishedAt) - StartedAt;

    public static bool IsNotMeasured(PairCheckResult result) =>
        result.Status is RunStatus.Failed or RunStatus.Unmeasurable or RunStatus.Interrupted;

    /// <summary>The findings that fail the step, worst first.</summary>
    public IReadOnlyList<Finding> Failures(PairCheckResult result) =>
        [.. result.Findings.Where(f => f.Severity >= FailAt).OrderByDescending(f => f.Severity)];

    /// <summary>The findings reported without failing the step, worst first.</summary>
    public IReadOnlyList<Finding> Others(PairCheckResult result) =>
        [.. result.Findings.Where(f => f.Severity < FailAt).OrderByDescending(f => f.Severity)];

    /// <summary>"critical became_perfect (p &lt; 0.001, effect 0.07)": severity, kind and the figures that decided.</summary>
    public static string Headline(Finding finding)
    {
        ArgumentNullException.ThrowIfNull(finding);
        var figures = new List<string>(2);
        if (finding.PValue is not null)
        {
            figures.Add("p " + Figures.PValue(finding.PValue));
        }

        if (finding.Effect is not null)
        {
            figures.Add("effect " + Figures.Number(finding.Effect));
        }

        var head = JsonContract.Name(finding.Severity) + " " + JsonContract.Name(finding.Kind);
        return figures.Count == 0 ? head : head + " (" + string.Join(", ", figures) + ")";
    }

    /// <summary>"r 0.931 → 1.000 (baseline → now)"; the baseline side is "—" while there is none.</summary>
    public static string CorrelationMove(PairCheckResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        return Figures.Correlation(result.JudgedAgainst?.PearsonR) + " → " + Figures.Correlation(result.Profile?.PearsonR);
    }

    /// <summary>The key figures of a measured check, baseline beside now: r, slope and the rows used.</summary>
    public static string KeyFigures(PairCheckResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var baseline = result.JudgedAgainst;
        var now = result.Profile;
        return $"r {CorrelationMove(result)}, slope {Figures.Number(baseline?.Slope)} → {Figures.Number(now?.Slope)} " +
            $"(baseline → now); rows used {Figures.Count(now?.NUsed)}" +
            (result.HasBaseline ? string.Empty : "; no baseline yet");
    }
}
