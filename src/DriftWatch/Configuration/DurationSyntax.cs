using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;

namespace DriftWatch.Configuration;

/// <summary>
/// Durations as written in the file: a number and a unit, largest unit first, each unit once:
/// <c>30s</c>, <c>15m</c>, <c>24h</c>, <c>30d</c>, <c>1h30m</c>, <c>2d12h</c>. TimeSpan's own parser reads
/// "1.02:03:04", which nobody writes in a config, hence this small grammar.
/// </summary>
internal static partial class DurationSyntax
{
    public const string Examples = "30s, 15m, 24h, 30d or 1h30m";

    private static readonly (char Unit, long Seconds)[] Units = [('d', 86_400), ('h', 3_600), ('m', 60), ('s', 1)];

    public static bool TryParse(string text, out TimeSpan value, out string? problem)
    {
        value = TimeSpan.Zero;
        problem = null;
        var match = Grammar().Match(text);
        if (!match.Success)
        {
            problem = text.Length > 0 && text.All(char.IsAsciiDigit)
                ? $"'{text}' has no unit; write e.g. {text}s or {text}m"
                : $"'{text}' is not a duration; write e.g. {Examples}";
            return false;
        }

        long seconds = 0;
        foreach (var (unit, factor) in Units)
        {
            var group = match.Groups[unit.ToString()];
            if (!group.Success)
            {
                continue;
            }

            // Ten digits at most per part, so the sum cannot overflow a long; the range check is the caller's.
            seconds += long.Parse(group.Value, NumberStyles.None, CultureInfo.InvariantCulture) * factor;
        }

        if (seconds > (long)TimeSpan.MaxValue.TotalSeconds)
        {
            problem = $"'{text}' is too long a duration";
            return false;
        }

        value = TimeSpan.FromSeconds(seconds);
        return true;
    }

    /// <summary>The shortest spelling the parser reads back to the same value ("1h30m", "35d").</summary>
    public static string Format(TimeSpan value)
    {
        var seconds = (long)value.TotalSeconds;
        if (seconds == 0)
        {
            return "0s";
        }

        var text = new StringBuilder();
        foreach (var (unit, factor) in Units)
        {
            if (seconds >= factor)
            {
                text.Append(CultureInfo.InvariantCulture, $"{seconds / factor}{unit}");
                seconds %= factor;
            }
        }

        return text.ToString();
    }

    [GeneratedRegex(@"^(?=\d)(?:(?<d>\d{1,10})d)?(?:(?<h>\d{1,10})h)?(?:(?<m>\d{1,10})m)?(?:(?<s>\d{1,10})s)?$", RegexOptions.CultureInvariant)]
    private static partial Regex Grammar();
}
