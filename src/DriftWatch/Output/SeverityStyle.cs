using DriftWatch.Core.Findings;
using Spectre.Console;

namespace DriftWatch.Output;

/// <summary>How a severity looks in a terminal. The word is always printed, so colour is never the only cue.</summary>
internal static class SeverityStyle
{
    public static Color Colour(Severity severity) => severity switch
    {
        Severity.Critical => Color.Red,
        Severity.Warning => Color.Yellow,
        _ => Color.Blue,
    };

    public static string Label(Severity severity) => JsonContract.Name(severity).ToUpperInvariant();

    /// <summary>Markup such as "[bold red]CRITICAL[/]", padded so a list of findings lines up.</summary>
    public static string Markup(Severity severity) =>
        $"[bold {Colour(severity).ToMarkup()}]{Label(severity),-8}[/]";
}
