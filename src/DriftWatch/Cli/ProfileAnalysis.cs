using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>Profiles the extracts and assesses them with the statistics engine of DriftWatch.Core.</summary>
internal static class ProfileAnalysis
{
    public static ProfileReport Run(PairedSample current, PairedSample? baseline, PairExpectation expectation, Thresholds thresholds, ProfileLabels labels)
    {
        // Placeholder until the statistics engine (branch stats) is merged; replaced by Profiler/FindingEngine calls.
        throw new NotSupportedException("The statistics engine is not merged into this branch yet.");
    }
}
