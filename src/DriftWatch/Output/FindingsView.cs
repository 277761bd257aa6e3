using DriftWatch.Core.Findings;
using Spectre.Console;

namespace DriftWatch.Output;

/// <summary>
/// The findings list every command shows: worst first, one headline per finding (severity, kind, p and
/// effect), the message indented below it, then the caution line.
/// </summary>
internal static class FindingsView
{
    public static void Render(IAnsiConsole console, IReadOnlyList<Finding> findings)
    {
        ArgumentNullException.ThrowIfNull(console);
        ArgumentNullException.ThrowIfNull(findings);

        // A heading line rather than a rule: a rule spans the whole width, which is thousands of columns in a pipe.
        console.MarkupLine("[bold]Findings[/]");
        if (findings.Count == 0)
        {
            console.MarkupLine("[green]No findings.[/]");
        }

        foreach (var finding in findings.OrderByDescending(f => f.Severity))
        {
            console.MarkupLine($"{SeverityStyle.Markup(finding.Severity)} [bold]{JsonContract.Name(finding.Kind)}[/]{Figures(finding)}");
            console.Write(new Padder(new Text(finding.Message), new Padding(9, 0, 0, 0)));
        }

        console.WriteLine();
        console.MarkupLine($"[dim]{Markup.Escape(Cautions.SignalsNotProof)}[/]");
    }

    private static string Figures(Finding finding)
    {
        var parts = new List<string>(2);
        if (finding.PValue is not null)
        {
            parts.Add("p " + Output.Figures.PValue(finding.PValue));
        }

        if (finding.Effect is not null)
        {
            parts.Add("effect " + Output.Figures.Number(finding.Effect));
        }

        return parts.Count == 0 ? string.Empty : Markup.Escape("  (" + string.Join(", ", parts) + ")");
    }
}
