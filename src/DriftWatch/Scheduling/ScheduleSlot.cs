using System.Globalization;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>
/// The slot a job run is for: the trigger's scheduled time. A check recovered on another worker (its first worker died
/// mid-check) fires from a one-off recovery trigger; the slot is then the original trigger's scheduled time, which
/// Quartz hands over in the job data.
/// </summary>
internal static class ScheduleSlot
{
    public static DateTimeOffset? Of(IJobExecutionContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (context.Recovering && context.MergedJobDataMap.TryGetValue(SchedulerConstants.FailedJobOriginalTriggerScheduledFireTime, out var value) && Parse(value) is { } original)
        {
            return original;
        }

        // A manual trigger (TriggerJob) has no slot of the schedule.
        return context.Trigger.Key.Group == PairSchedules.Group ? context.ScheduledFireTimeUtc : null;
    }

    /// <summary>The job data value as Quartz versions have written it: Unix milliseconds, ticks, or a date text.</summary>
    internal static DateTimeOffset? Parse(object? value) => value switch
    {
        DateTimeOffset at => at,
        long n => FromNumber(n),
        string text when long.TryParse(text, NumberStyles.Integer, CultureInfo.InvariantCulture, out var n) => FromNumber(n),
        string text when DateTimeOffset.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal, out var at) => at.ToUniversalTime(),
        _ => null,
    };

    // Unix milliseconds stay below 1e14 until the year 5138; ticks of any date after year 1 are above it.
    private static DateTimeOffset FromNumber(long n) =>
        n < 100_000_000_000_000L ? DateTimeOffset.FromUnixTimeMilliseconds(n) : new DateTimeOffset(n, TimeSpan.Zero);
}
