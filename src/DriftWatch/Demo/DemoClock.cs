namespace DriftWatch.Demo;

/// <summary>
/// The demo's clock: stands still until the runner moves it to the next simulated check time, so 21 days
/// pass in seconds through the same code the worker runs on the system clock. The framework's fake clock
/// lives in a test-only package, and this needs nothing of it but a settable "now".
/// </summary>
internal sealed class DemoClock(DateTimeOffset start) : TimeProvider
{
    private readonly Lock _gate = new();
    private DateTimeOffset _now = start;

    /// <summary>Checks read the clock from several threads; a DateTimeOffset is not written atomically.</summary>
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
