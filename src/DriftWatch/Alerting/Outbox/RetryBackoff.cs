namespace DriftWatch.Alerting.Outbox;

/// <summary>Exponential backoff with jitter (common practice for retrying against a shared server).</summary>
internal static class RetryBackoff
{
    /// <summary>
    /// The wait after failed attempt number <paramref name="attempt"/> (1 = the first): min(max, base · 2^(attempt−1)),
    /// of which the fraction <see cref="OutboxOptions.Jitter"/> is scaled by a draw from <paramref name="random"/>.
    /// </summary>
    public static TimeSpan Delay(int attempt, OutboxOptions options, Random random)
    {
        ArgumentNullException.ThrowIfNull(options);
        ArgumentNullException.ThrowIfNull(random);
        ArgumentOutOfRangeException.ThrowIfLessThan(attempt, 1);
        // Doubling past 2^30 would overflow long before it matters; the cap has long taken over by then.
        var exponent = Math.Min(attempt - 1, 30);
        var ticks = Math.Min(options.RetryMax.Ticks, options.RetryBase.Ticks * (double)(1L << exponent));
        var jitter = Math.Clamp(options.Jitter, 0, 1);
        return TimeSpan.FromTicks((long)(ticks * (1 - jitter * random.NextDouble())));
    }
}
