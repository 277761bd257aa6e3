using DriftWatch.Configuration;
using Quartz;

namespace DriftWatch.Tests.Configuration;

public sealed class CronSchedulesTests
{
    [Theory]
    [InlineData("0 0 * * * ?", "0 0 * * * ?")]
    [InlineData("0 15 6 * * ?", "0 15 6 * * ?")]
    [InlineData("0 0 12 ? * MON-FRI 2030", "0 0 12 ? * MON-FRI 2030")]
    [InlineData("*/30 * * * *", "0 */30 * * * ?")]
    [InlineData("30 4 * * 1", "0 30 4 ? * MON")]
    [InlineData("0 9 * * 0", "0 0 9 ? * SUN")]
    [InlineData("@daily", "0 0 0 * * ?")]
    public void Normalize_QuartzAndCrontab_GiveQuartzForm(string text, string expected)
    {
        Assert.Equal(expected, CronSchedules.Normalize(text, out var problem));
        Assert.Null(problem);
    }

    /// <summary>
    /// A crontab line means what crontab(5) says (Vixie cron's manual, from memory): "30 4 * * 1" is 04:30
    /// every Monday and day-of-week 0 and 7 both mean Sunday. Quartz's own evaluator, reading our result,
    /// must fire exactly then. 1 March 2026 is a Sunday (1 January 2026 is a Thursday).
    /// </summary>
    [Theory]
    [InlineData("30 4 * * 1", "2026-03-01T00:00:00Z", "2026-03-02T04:30:00Z")]
    [InlineData("0 9 * * 7", "2026-03-01T09:00:00Z", "2026-03-08T09:00:00Z")]
    [InlineData("0 9 * * 0", "2026-03-01T08:59:00Z", "2026-03-01T09:00:00Z")]
    [InlineData("15 */6 * * *", "2026-03-01T00:15:00Z", "2026-03-01T06:15:00Z")]
    [InlineData("0 0 1 * *", "2026-03-01T00:00:00Z", "2026-04-01T00:00:00Z")]
    public void Normalize_CrontabLine_FiresWhenCrontabWould(string crontab, string after, string expected)
    {
        var quartz = CronSchedules.Normalize(crontab, out _)!;
        var expression = CronExpression.Parse(quartz).WithTimeZone(TimeZoneInfo.Utc);
        Assert.Equal(Time(expected), expression.GetNextValidTimeAfter(Time(after)));
    }

    private static DateTimeOffset Time(string text) =>
        DateTimeOffset.Parse(text, System.Globalization.CultureInfo.InvariantCulture, System.Globalization.DateTimeStyles.AssumeUniversal);

    [Fact]
    public void Normalize_WrongFieldCount_ExplainsBothForms()
    {
        Assert.Null(CronSchedules.Normalize("0 0 * *", out var problem));
        Assert.Equal("'0 0 * *' has 4 fields; write a Quartz cron expression (seconds minutes hours day-of-month month day-of-week [year], e.g. '0 0 * * * ?') or a five-field crontab line (e.g. '0 * * * *')", problem);
    }
}
