using DriftWatch.Core.Configuration;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Configuration;

/// <summary>What every pair starts from before its own keys apply.</summary>
internal sealed record PairDefaults(string Schedule, SampleSpec Sample, Thresholds Thresholds, BaselinePolicy Baseline)
{
    public static PairDefaults Builtin { get; } = new(PairConfig.DefaultSchedule, new SampleSpec(), Thresholds.Default, new BaselinePolicy());
}

/// <summary><c>defaults:</c> schedule, sample, thresholds and baseline for every pair.</summary>
internal static class DefaultsSection
{
    public static PairDefaults Read(MappingReader? reader)
    {
        var builtin = PairDefaults.Builtin;
        if (reader is null)
        {
            return builtin;
        }

        var result = new PairDefaults(
            ScheduleKey.Read(reader) ?? builtin.Schedule,
            SampleSection.Read(reader.Mapping("sample", ConfigKeys.Sample), builtin.Sample),
            ThresholdsSection.Read(reader.Mapping("thresholds", ConfigKeys.Thresholds), builtin.Thresholds),
            BaselineSection.Read(reader.Mapping("baseline", ConfigKeys.Baseline)) ?? builtin.Baseline);
        reader.Done();
        return result;
    }
}
