using System.Globalization;
using DriftWatch.Output;

namespace DriftWatch.Demo;

/// <summary>
/// The summary printed after the last day: one row per fault (and the control), what DriftWatch said, where the
/// files are. Plain aligned text rather than a boxed table: rows stay whole when the output is redirected or
/// pasted, where a table would be folded to 80 columns.
/// </summary>
internal static class DemoReport
{
    private static readonly string[] Headers = ["pair", "fault", "injected", "detected", "finding", "alert confirmed"];

    public static void Render(TextWriter output, DemoRun run)
    {
        ArgumentNullException.ThrowIfNull(output);
        ArgumentNullException.ThrowIfNull(run);
        var outcome = run.Outcome;
        var control = TerminalScenario.Control;
        var rows = new List<string[]>
        {
            new[] { control.Name, "none (control pair)", "-", "-", outcome.ControlFalseAlarms == 0 && outcome.ControlFailures == 0 ? "silent" : "FALSE ALARMS", "-" },
        };
        rows.AddRange(outcome.Faults.Select(f => new[]
        {
            f.Fault.Pair,
            f.Fault.Description,
            Day(f.Fault.Day),
            f.DetectedDay is { } d ? Lag(d, f.Fault.Day) : Verdict(f.Verdict),
            JsonContract.Name(f.Fault.Expected),
            f.AlertDay is { } a ? Day(a) : "-",
        }));

        output.WriteLine("What the demo injected and what DriftWatch found");
        var widths = Enumerable.Range(0, Headers.Length).Select(i => rows.Max(r => r[i].Length)).Select((w, i) => Math.Max(w, Headers[i].Length)).ToArray();
        WriteRow(output, Headers, widths);
        WriteRow(output, [.. widths.Select(w => new string('-', w))], widths);
        foreach (var row in rows)
        {
            WriteRow(output, row, widths);
        }

        output.WriteLine();
        output.WriteLine(string.Create(
            CultureInfo.InvariantCulture,
            $"Control pair {control.Name}: {outcome.ControlFalseAlarms} false alarms (findings at warning or worse) in {outcome.ControlChecks} checks; {outcome.ControlFindings} findings of any severity; {outcome.ControlFailures} failed checks."));
        foreach (var text in outcome.FalseAlarmTexts)
        {
            output.WriteLine("  false alarm " + text);
        }

        var caught = outcome.Faults.Where(f => f.Verdict == FaultVerdict.Caught && f.Evidence is not null).ToArray();
        if (caught.Length > 0)
        {
            output.WriteLine();
            output.WriteLine("What DriftWatch said (first detection of each fault):");
            foreach (var fault in caught)
            {
                output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"  day {fault.DetectedDay:00} {fault.Fault.Pair}: {fault.Evidence}"));
            }
        }

        output.WriteLine();
        var missed = outcome.Faults.Count(f => f.Verdict == FaultVerdict.Missed);
        var due = outcome.Faults.Count(f => f.Verdict is FaultVerdict.Caught or FaultVerdict.Missed);
        output.WriteLine(outcome.Success
            ? string.Create(CultureInfo.InvariantCulture, $"PASS: every fault due within {outcome.Days} days was caught within {ScenarioFault.DefaultAllowedLag} days of its injection ({due} of {due}), and the control pair stayed silent.")
            : string.Create(CultureInfo.InvariantCulture, $"FAIL: {missed} of {due} faults missed; {outcome.ControlFalseAlarms} false alarms and {outcome.ControlFailures} failed checks on the control pair."));
        output.WriteLine();
        output.WriteLine($"  store           {Path.Combine(run.Folder, DemoFolder.StoreFile)}");
        output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"  alert mails     {Path.Combine(run.Folder, DemoFolder.MailFolder)} ({run.MailFiles} .eml files)"));
        if (run.ReportPath is { } report)
        {
            output.WriteLine($"  static report   {report}");
        }

        output.WriteLine($"  configuration   {run.ConfigPath}");
        output.WriteLine($"  look around     driftwatch history {TerminalScenario.Trucks.Name} --config {run.ConfigPath}");
        output.WriteLine();
        output.WriteLine($"{Cautions.SignalsNotProof} {Cautions.PlotsCarryData} The data is invented.");
    }

    private static void WriteRow(TextWriter output, string[] cells, int[] widths) =>
        output.WriteLine(string.Join("  ", cells.Select((c, i) => i == cells.Length - 1 ? c : c.PadRight(widths[i]))).TrimEnd());

    private static string Day(int day) => day.ToString("00", CultureInfo.InvariantCulture);

    private static string Lag(int detected, int injected) =>
        detected == injected ? Day(detected) : string.Create(CultureInfo.InvariantCulture, $"{Day(detected)} (+{detected - injected})");

    private static string Verdict(FaultVerdict verdict) => verdict switch
    {
        FaultVerdict.Missed => "MISSED",
        FaultVerdict.NotReached => "not reached",
        FaultVerdict.NotYet => "not yet",
        _ => "-",
    };
}
