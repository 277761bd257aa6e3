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
        PairDeclaration declared,
        Thresholds thresholds,
        ProfileLabels labels)
    {
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(labels);
        var currentProfile = Profiler.Profile(current, thresholds);
        var baselineProfile = baseline is null ? null : Profiler.Profile(baseline, thresholds);
        // As in a check: an extract with nothing to measure is reported as such, never compared.
        var unmeasurable = Measurability.Assess(currentProfile, null, thresholds, labels.XName, labels.YName);
        var findings = unmeasurable is not null
            ? []
            : FindingEngine.Assess(currentProfile, current, baselineProfile, baseline, declared, thresholds, labels.XName, labels.YName);
        return new ProfileReport(currentProfile, baselineProfile, findings, labels, unmeasurable);
    }
}
