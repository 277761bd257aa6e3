namespace DriftWatch.Configuration;

/// <summary>The <c>schedule</c> key: a cron expression, kept in Quartz form.</summary>
internal static class ScheduleKey
{
    public static string? Read(MappingReader reader)
    {
        var text = reader.Text("schedule");
        if (text is null)
        {
            return null;
        }

        var schedule = CronSchedules.Normalize(text, out var problem);
        if (schedule is null)
        {
            reader.Error("schedule", problem!);
        }

        return schedule;
    }
}
