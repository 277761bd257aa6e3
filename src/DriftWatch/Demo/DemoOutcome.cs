namespace DriftWatch.Demo;

/// <summary>
/// What the demo found, read back from the store after the last day: per fault whether and when it was caught,
/// and how the control pair fared.
/// </summary>
/// <param name="ControlFalseAlarms">Findings at warning or worse on the control pair, every day together (must be 0).</param>
/// <param name="ControlFindings">All findings on the control pair, info included.</param>
/// <param name="ControlFailures">Checks of the control pair that could not run (must be 0).</param>
/// <param name="FalseAlarmTexts">"day 07: kind (severity): message" for each false alarm, for the report.</param>
internal sealed record DemoOutcome(
    int Days,
    IReadOnlyList<FaultOutcome> Faults,
    int ControlChecks,
    int ControlFalseAlarms,
    int ControlFindings,
    int ControlFailures,
    IReadOnlyList<string> FalseAlarmTexts)
{
    /// <summary>Every fault due within the simulated days was caught and the control pair stayed silent.</summary>
    public bool Success =>
        Faults.All(f => f.Verdict != FaultVerdict.Missed) && ControlFalseAlarms == 0 && ControlFailures == 0;

    /// <summary>0 on success, 1 otherwise: a script or CI job can run the demo as a smoke test.</summary>
    public int ExitCode => Success ? 0 : 1;
}
