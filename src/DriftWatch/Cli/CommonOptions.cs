using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>Options several commands share, so they are spelled, parsed and described alike.</summary>
internal static class CommonOptions
{
    /// <summary>--format table|json; absent means table (the first enum member, so no default is shown as "Table").</summary>
    public static Option<OutputFormat> Format() => new("--format")
    {
        Description = "Output: 'table' for people (the default; plain text when redirected or NO_COLOR is set) or 'json' for scripts.",
        HelpName = "table|json",
        CustomParser = result =>
        {
            var token = Token(result);
            if (Enum.TryParse<OutputFormat>(token, ignoreCase: true, out var format) && Enum.IsDefined(format) && !int.TryParse(token, CultureInfo.InvariantCulture, out _))
            {
                return format;
            }

            result.AddError($"--format must be 'table' or 'json', was '{token}'");
            return default;
        },
    };

    /// <summary>
    /// A number option read in invariant culture and checked against the open interval (low, high); an
    /// error names the option and the value it had.
    /// </summary>
    public static Option<double?> Number(string name, double low, double high, string description, string helpName) => new(name)
    {
        Description = description,
        HelpName = helpName,
        CustomParser = result =>
        {
            var token = Token(result);
            if (!double.TryParse(token, NumberStyles.Float, CultureInfo.InvariantCulture, out var value))
            {
                result.AddError($"{name} must be a number, was '{token}'");
                return null;
            }

            if (!(value > low && value < high))
            {
                result.AddError(double.IsPositiveInfinity(high)
                    ? string.Create(CultureInfo.InvariantCulture, $"{name} must be greater than {low}, was {token}")
                    : string.Create(CultureInfo.InvariantCulture, $"{name} must be between {low} and {high} (exclusive), was {token}"));
                return null;
            }

            return value;
        },
    };

    private static string Token(ArgumentResult result) => result.Tokens.Count > 0 ? result.Tokens[0].Value : string.Empty;
}
