using System.Globalization;
using DriftWatch.Output;
using Spectre.Console;

namespace DriftWatch.Demo;

/// <summary>The summary printed after the last day: one row per fault (and the control), what was said, where the files are.</summary>
internal static class DemoReport
{
    public static void Render(IAnsiConsole console, DemoRun run)
    {
        ArgumentNullException.ThrowIfNull(console);
        ArgumentNullException.ThrowIfNull(run);
        var outcome = run.Outcome;
        var table = new Table().Border(TableBorder.Rounded).Title("[bold]What the demo injected and what DriftWatch found[/]");
        table.AddColumns("pair", "fault", "injected", "detected", "finding", "alert");
        var control = TerminalScenario.Control;
        table.AddRow(
            Markup.Escape(control.Name),
            "none (control pair)",
            "-",
            "-",
            outcome.ControlFalseAlarms == 0 && outcome.ControlFailures == 0 ? "[green]silent[/]" : "[red]false alarms[/]",
            "-");
        foreach (var fault in outcome.Faults)
        {
            table.AddRow(
                Markup.Escape(fault.Fault.Pair),
                Markup.Escape(fault.Fault.Description),
                Day(fault.Fault.Day),
                fault.DetectedDay is { } d ? Lag(d, fault.Fault.Day) : Verdict(fault.Verdict),
                Markup.Escape(JsonContract.Name(fault.Fault.Expected)),
                fault.AlertDay is { } a ? Day(a) : outcome.AlertsWired ? "-" : "[grey]not wired[/]");
        }

        console.Write(table);
        console.WriteLine();
        console.MarkupLine(Markup.Escape(string.Create(
            CultureInfo.InvariantCulture,
            $"Control pair {control.Name}: {outcome.ControlFalseAlarms} false alarms (findings at warning or worse) in {outcome.ControlChecks} checks, {outcome.ControlFindings} findings of any severity, {outcome.ControlFailures} failed checks.")));
        foreach (var text in outcome.FalseAlarmTexts)
        {
            console.MarkupLine("  [red]false alarm[/] " + Markup.Escape(text));
        }

        var caught = outcome.Faults.Where(f => f.Verdict == FaultVerdict.Caught && f.Evidence is not null).ToArray();
        if (caught.Length > 0)
        {
            console.WriteLine();
            console.MarkupLine("[bold]What DriftWatch said[/] (first detection of each fault):");
            foreach (var fault in caught)
            {
                console.MarkupLine(Markup.Escape(string.Create(CultureInfo.InvariantCulture, $"  day {fault.DetectedDay:00} {fault.Fault.Pair}: {fault.Evidence}")));
            }
        }

        console.WriteLine();
        var missed = outcome.Faults.Count(f => f.Verdict == FaultVerdict.Missed);
        var due = outcome.Faults.Count(f => f.Verdict is FaultVerdict.Caught or FaultVerdict.Missed);
        console.MarkupLine(outcome.Success
            ? $"[green]Every fault due within {outcome.Days} days was caught within {ScenarioFault.DefaultAllowedLag} days of its injection ({due - missed} of {due}), and the control pair stayed silent.[/]"
            : $"[red]Not a clean run: {missed} of {due} faults missed, {outcome.ControlFalseAlarms} false alarms and {outcome.ControlFailures} failed checks on the control pair.[/]");
        console.WriteLine();
        console.MarkupLine(Markup.Escape($"  store           {Path.Combine(run.Folder, DemoFolder.StoreFile)}"));
        console.MarkupLine(Markup.Escape(string.Create(CultureInfo.InvariantCulture, $"  alert mails     {Path.Combine(run.Folder, DemoFolder.MailFolder)} ({run.MailFiles} .eml files)")));
        if (run.ReportPath is { } report)
        {
            console.MarkupLine(Markup.Escape($"  static report   {report}"));
        }

        console.MarkupLine(Markup.Escape($"  configuration   {run.ConfigPath}"));
        console.MarkupLine(Markup.Escape($"  next            driftwatch history {TerminalScenario.Trucks.Name} --config {run.ConfigPath}"));
        console.WriteLine();
        console.MarkupLine($"[grey]{Markup.Escape(Cautions.SignalsNotProof)} {Markup.Escape(Cautions.PlotsCarryData)} The data is invented.[/]");
    }

    private static string Day(int day) => day.ToString("00", CultureInfo.InvariantCulture);

    private static string Lag(int detected, int injected) =>
        detected == injected ? Day(detected) : string.Create(CultureInfo.InvariantCulture, $"{Day(detected)} (+{detected - injected})");

    private static string Verdict(FaultVerdict verdict) => verdict switch
    {
        FaultVerdict.Missed => "[red]missed[/]",
        FaultVerdict.NotReached => "[grey]not reached[/]",
        FaultVerdict.Pending => "[yellow]not yet[/]",
        _ => "-",
    };
}
