using DriftWatch.Configuration;

namespace DriftWatch.Tests.Configuration;

public sealed class DurationSyntaxTests
{
    // Expected values are worked out by hand from the unit definitions (1d = 24h, 1h = 60m, 1m = 60s).
    [Theory]
    [InlineData("30s", 30)]
    [InlineData("15m", 900)]
    [InlineData("24h", 86_400)]
    [InlineData("30d", 2_592_000)]
    [InlineData("1h30m", 5_400)]
    [InlineData("2d12h", 216_000)]
    [InlineData("1d2h3m4s", 93_784)]
    [InlineData("90s", 90)]
    public void TryParse_ValidText_GivesSeconds(string text, long seconds)
    {
        Assert.True(DurationSyntax.TryParse(text, out var value, out var problem), problem);
        Assert.Equal(TimeSpan.FromSeconds(seconds), value);
    }

    [Theory]
    [InlineData("")]
    [InlineData("h")]
    [InlineData("1.5h")]
    [InlineData("30m1h")]
    [InlineData("1h1h")]
    [InlineData("1H")]
    [InlineData("1 h")]
    [InlineData("-5m")]
    [InlineData("10ms")]
    [InlineData("1w")]
    [InlineData("PT1H")]
    public void TryParse_Garbage_IsRefusedWithExamples(string text)
    {
        Assert.False(DurationSyntax.TryParse(text, out _, out var problem));
        Assert.Equal($"'{text}' is not a duration; write e.g. 30s, 15m, 24h, 30d or 1h30m", problem);
    }

    [Fact]
    public void TryParse_HugeValue_IsRefused()
    {
        Assert.False(DurationSyntax.TryParse("9999999999d", out _, out var problem));
        Assert.Equal("'9999999999d' is too long a duration", problem);
    }

    [Theory]
    [InlineData(5_400, "1h30m")]
    [InlineData(3_024_000, "35d")]
    [InlineData(61, "1m1s")]
    [InlineData(0, "0s")]
    public void Format_ReadsBackToTheSameValue(long seconds, string text)
    {
        Assert.Equal(text, DurationSyntax.Format(TimeSpan.FromSeconds(seconds)));
        if (seconds > 0)
        {
            Assert.True(DurationSyntax.TryParse(text, out var back, out _));
            Assert.Equal(TimeSpan.FromSeconds(seconds), back);
        }
    }
}
