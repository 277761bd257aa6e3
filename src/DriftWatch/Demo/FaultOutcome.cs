namespace DriftWatch.Demo;

internal enum FaultVerdict
{
    /// <summary>The expected signal came on the fault's day or within its allowed lag.</summary>
    Caught,

    /// <summary>The allowed lag passed without the expected signal.</summary>
    Missed,

    /// <summary>The fault's day lies beyond the simulated days (--days).</summary>
    NotReached,

    /// <summary>Injected, not yet seen, and the simulation stopped before its allowed lag ran out.</summary>
    NotYet,
}

/// <param name="DetectedDay">The first day within the allowed lag that showed the expected signal.</param>
/// <param name="Evidence">The finding's message, or the failed check's error, that counts as the detection.</param>
/// <param name="AlertDay">The day the (pair, kind) alert was confirmed; null when it was not.</param>
internal sealed record FaultOutcome(
    ScenarioFault Fault,
    FaultVerdict Verdict,
    int? DetectedDay,
    string? Evidence,
    int? AlertDay);
