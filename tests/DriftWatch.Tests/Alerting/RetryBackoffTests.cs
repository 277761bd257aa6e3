using DriftWatch.Alerting.Outbox;



namespace DriftWatch.Tests.Alerting;

// Exponential backoff with jitter: delay = min(max, base · 2^(n−1)), reduced by up to the jitter share
// (common practice for retries against shared servers).
public sealed class RetryBackoffTests
{
    private static readonly OutboxOptions Options = new() { RetryBase = TimeSpan.FromSeconds(30), RetryMax = TimeSpan.FromHours(1), Jitter = 0.5 };

    [Theory]
    [InlineData(1, 30)]
    [InlineData(2, 60)]
    [InlineData(3, 120)]
    [InlineData(7, 1920)]
    [InlineData(8, 3600)]
    [InlineData(40, 3600)]
    public void Delay_NoJitterDrawn_DoublesUpToTheCap(int attempt, int seconds) =>
        Assert.Equal(TimeSpan.FromSeconds(seconds), RetryBackoff.Delay(attempt, Options, new FixedRandom(0)));

    [Fact]
    public void Delay_LargestJitterDraw_TakesOffTheJitterShare()
    {
        Assert.Equal(TimeSpan.FromSeconds(15), RetryBackoff.Delay(1, Options, new FixedRandom(1.0)));
        Assert.Equal(TimeSpan.FromSeconds(90), RetryBackoff.Delay(3, Options, new FixedRandom(0.5)));
    }

    [Fact]
    public void Delay_SeededRandom_StaysWithinTheJitterRange()
    {
        var random = new Random(20260302);
        for (var attempt = 1; attempt <= 12; attempt++)
        {
            var ceiling = Math.Min(3600, 30 * Math.Pow(2, attempt - 1));
            var delay = RetryBackoff.Delay(attempt, Options, random).TotalSeconds;
            Assert.InRange(delay, ceiling / 2, ceiling);
        }
    }

    [Fact]
    public void Delay_AttemptZero_Throws() =>
        Assert.Throws<ArgumentOutOfRangeException>(() => RetryBackoff.Delay(0, Options, new Random(1)));
}

/// <summary>A Random whose draws are fixed, to pin the jitter.</summary>
internal sealed class FixedRandom(double value) : Random
{
    public override double NextDouble() => value;
}
