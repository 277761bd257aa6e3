using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;
using System.Text.RegularExpressions;

namespace DriftWatch.Cli;

/// <summary>
/// <c>check --as-of TIME</c>: an ISO 8601 date and time with <c>Z</c> or an offset (2026-03-01T06:00:00Z,
/// 2026-03-01T08:00+02:00). A time without an offset is refused rather than guessed: local time and UTC differ.
/// </summary>
internal static partial class AsOfOption
{
    public static Option<DateTimeOffset?> Create() => new("--as-of")
    {
        Description = "Check as of this past time (ISO 8601 with Z or an offset, e.g. 2026-03-01T06:00:00Z): the window ends there " +
            "(or, with window anchor latest, at the newest value at or before it). The runs are recorded at that time, marked back-dated, " +
            "and never raise or mail an alert.",
        HelpName = "TIME",
        CustomParser = result =>
        {
            var token = result.Tokens.Count == 0 ? string.Empty : result.Tokens[0].Value;
            if (Parse(token) is { } at)
            {
                return at;
            }

            result.AddError($"--as-of must be an ISO 8601 date and time with Z or an offset, such as 2026-03-01T06:00:00Z or 2026-03-01T08:00:00+02:00; was '{token}'");
            return null;
        },
    };

    /// <summary>The time <paramref name="text"/> names, or null when it is not ISO 8601 with Z or an offset.</summary>
    public static DateTimeOffset? Parse(string text) =>
        text is not null
        && Shape().IsMatch(text)
        && DateTimeOffset.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.None, out var at)
            ? at
            : null;

    /// <summary>The as-of time must be in the past: a check of the future would read a window still filling.</summary>
    public static void CheckInPast(DateTimeOffset asOf, DateTimeOffset now)
    {
        if (asOf > now)
        {
            throw new CliUsageException(
                $"--as-of {asOf.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture)} is in the future " +
                $"(now is {now.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture)}); leave it out to check now");
        }
    }

    [GeneratedRegex(@"^\d{4}-\d{2}-\d{2}[Tt ]\d{2}:\d{2}(:\d{2}(\.\d{1,7})?)?([Zz]|[+-]\d{2}:?\d{2})$", RegexOptions.CultureInvariant)]
    private static partial Regex Shape();
}
