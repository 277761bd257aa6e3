using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>Profiles the extracts and assesses them with the statistics engine of DriftWatch.Core.</summary>
internal static class ProfileAnalysis
{
    public static ProfileReport Run(
        PairedSample current,
        PairedSample? baseline,
        PairExpectation expectation,
        Thresholds thresholds,
        ProfileLabels labels)
    {
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(labels);
        var currentProfile = Profiler.Profile(current, thresholds);
        var baselineProfile = baseline is null ? null : Profiler.Profile(baseline, thresholds);
        var findings = FindingEngine.Assess(
            currentProfile, current, baselineProfile, baseline, expectation, thresholds, labels.XName, labels.YName);
        return new ProfileReport(currentProfile, baselineProfile, findings, labels);
    }
}
