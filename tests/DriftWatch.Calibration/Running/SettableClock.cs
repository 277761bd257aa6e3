namespace DriftWatch.Calibration.Running;

/// <summary>A clock the runner moves to each simulated day's check time; checks read it from several threads.</summary>
internal sealed class SettableClock(DateTimeOffset start) : TimeProvider
{
    private readonly Lock _gate = new();
    private DateTimeOffset _now = start;

    public DateTimeOffset UtcNow
    {
        get
        {
            lock (_gate)
            {
                return _now;
            }
        }

        set
        {
            lock (_gate)
            {
                _now = value.ToUniversalTime();
            }
        }
    }

    public override DateTimeOffset GetUtcNow() => UtcNow;

    public override TimeZoneInfo LocalTimeZone => TimeZoneInfo.Utc;
}
