using System.CommandLine;
using System.CommandLine.Parsing;
using DriftWatch.Core.Findings;

namespace DriftWatch.Cli;

/// <summary>How <c>check</c> prints its result: the two formats every command has, and two for CI jobs.</summary>
internal enum CheckFormat
{
    /// <summary>Aligned tables for a person at a terminal (the default).</summary>
    Table,

    /// <summary>The JSON contract, for scripts.</summary>
    Json,

    /// <summary>JUnit XML, the test-report format CI servers read: one test case per pair.</summary>
    Junit,

    /// <summary>A Markdown summary for a CI job's page.</summary>
    Markdown,
}

/// <summary>The options only <c>check</c> has, spelled and validated in one place.</summary>
internal static class CheckOptions
{
    /// <summary>Findings at this severity or worse fail the step unless <c>--fail-at</c> says otherwise.</summary>
    public const Severity DefaultFailAt = Severity.Warning;

    public static Option<CheckFormat> Format() => new("--format")
    {
        Description = "Output: 'table' for people (the default), 'json' for scripts, 'junit' (JUnit XML) for a CI server's " +
            "test report, 'markdown' for a CI job's summary page.",
        HelpName = "table|json|junit|markdown",
        CustomParser = result => ParseWord(result, "--format", [("table", CheckFormat.Table), ("json", CheckFormat.Json), ("junit", CheckFormat.Junit), ("markdown", CheckFormat.Markdown)], CheckFormat.Table),
    };

    public static Option<string[]> Tags() => new("--tag", "-t")
    {
        Description = "Check the pairs carrying this tag (repeat for several: a pair carrying any of them is checked; " +
            "with --pair, that pair too).",
        HelpName = "TAG",
        Arity = ArgumentArity.OneOrMore,
        AllowMultipleArgumentsPerToken = false,
    };

    /// <summary>Absent means <see cref="DefaultFailAt"/>; nullable so help shows no enum member's name as the default.</summary>
    public static Option<Severity?> FailAt() => new("--fail-at")
    {
        Description = "The least severe finding that fails the step (exit code 1, a <failure> in JUnit): 'warning' " +
            "(the default) or 'critical'. Lower findings are still reported.",
        HelpName = "warning|critical",
        CustomParser = result => ParseWord<Severity?>(result, "--fail-at", [("warning", Severity.Warning), ("critical", Severity.Critical)], null),
    };

    public static Option<FileInfo?> Output() => new("--output", "-o")
    {
        Description = "Write the result to this file instead of standard output (replaced whole, never left half " +
            "written: for a CI job's artifacts). Progress and a one-line summary still go to standard error.",
        HelpName = "FILE",
    };

    /// <summary>One lower-case word out of a fixed set; an error lists the words and the value it had.</summary>
    private static T ParseWord<T>(ArgumentResult result, string name, IReadOnlyList<(string Word, T Value)> allowed, T fallback)
    {
        var token = result.Tokens.Count > 0 ? result.Tokens[0].Value : string.Empty;
        foreach (var (word, value) in allowed)
        {
            if (string.Equals(word, token, StringComparison.OrdinalIgnoreCase))
            {
                return value;
            }
        }

        var words = allowed.Select(a => "'" + a.Word + "'").ToArray();
        result.AddError($"{name} must be {string.Join(", ", words[..^1])} or {words[^1]}, was '{token}'");
        return fallback;
    }
}
