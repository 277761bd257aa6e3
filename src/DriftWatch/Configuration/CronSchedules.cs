using Quartz;

namespace DriftWatch.Configuration;

/// <summary>
/// Schedules are Quartz cron expressions (seconds first, six or seven fields). A five-field crontab line is
/// also read, through Quartz's own crontab dialect, which prepends the seconds and renumbers the days of
/// the week; what the pair keeps is always the Quartz form.
/// </summary>
internal static class CronSchedules
{
    /// <summary>The Quartz form, or null with <paramref name="problem"/> set.</summary>
    public static string? Normalize(string text, out string? problem)
    {
        problem = null;
        var trimmed = text.Trim();
        var fields = trimmed.Split(' ', StringSplitOptions.RemoveEmptyEntries).Length;
        var format = fields == 5 ? CronFormat.Unix : CronFormat.Quartz;
        CronExpression expression;
        try
        {
            expression = CronExpression.Parse(trimmed, format);
        }
        catch (FormatException ex)
        {
            problem = fields is 5 or 6 or 7 || trimmed.StartsWith('@')
                ? $"'{text}' is not a valid cron expression: {ex.Message}"
                : $"'{text}' has {fields} fields; write a Quartz cron expression (seconds minutes hours day-of-month month day-of-week [year], e.g. '0 0 * * * ?') or a five-field crontab line (e.g. '0 * * * *')";
            return null;
        }

        // A date that does not exist (30 February) parses but never fires.
        if (expression.GetNextValidTimeAfter(DateTimeOffset.UnixEpoch) is null)
        {
            problem = $"'{text}' never fires";
            return null;
        }

        return expression.CronExpressionString;
    }
}
