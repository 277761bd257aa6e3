using DriftWatch.Calibration.Faults;
using DriftWatch.Core.Findings;

namespace DriftWatch.Calibration.Reporting;

/// <summary>What one run measured, read back from the store; the report and the JSON are written from it.</summary>
internal sealed record CalibrationResults(
    DateTimeOffset StartedAt,
    TimeSpan Elapsed,
    string Source,
    int Seed,
    int Days,
    int BaselineDays,
    int FaultDay,
    bool Quick,
    long RowsLoaded,
    HealthyRates Healthy,
    IReadOnlyList<FaultOutcome> Faults)
{
    /// <summary>Faults whose expected alert was confirmed within two checks and, for unit changes, was critical and named the factor.</summary>
    public int FaultsMeetingBar => Faults.Count(f => f.MeetsBar);

    public double ShareMeetingBar => Faults.Count == 0 ? double.NaN : (double)FaultsMeetingBar / Faults.Count;

    public int FaultsCaught => Faults.Count(f => f.Caught);

    public int FaultsWithAnyAlert => Faults.Count(f => f.AnyAlert);
}

/// <summary>
/// Healthy pairs over the monitored days. <see cref="Findings"/> counts findings of severity warning or worse;
/// <see cref="Confirmed"/> counts alerts that reached the confirmed state on a monitored day.
/// </summary>
internal sealed record HealthyRates(
    int Pairs,
    int Checks,
    int Findings,
    int Confirmed,
    int UnmeasuredBaseline,
    int UnmeasuredMonitored,
    IReadOnlyList<KindCount> ByKind,
    IReadOnlyList<FamilyCount> ByFamily,
    IReadOnlyList<string> UnmeasuredSamples)
{
    public double FindingsPerThousand => PerThousand(Findings, Checks);

    public double ConfirmedPerThousand => PerThousand(Confirmed, Checks);

    public static double PerThousand(int count, int checks) => checks == 0 ? double.NaN : 1000.0 * count / checks;
}

/// <param name="Kind">snake_case, as stored and printed.</param>
internal sealed record KindCount(string Kind, int Findings, int Confirmed);

/// <param name="Unmeasured">Runs that did not measure (failed, or any status other than succeeded), baseline days included.</param>
internal sealed record FamilyCount(string Family, int Pairs, int Checks, int Findings, int Confirmed, int Unmeasured)
{
    public double FindingsPerThousand => HealthyRates.PerThousand(Findings, Checks);

    public double ConfirmedPerThousand => HealthyRates.PerThousand(Confirmed, Checks);
}

/// <summary>
/// One faulty pair after injection on day d: <see cref="Caught"/> when an alert of an expected kind confirmed on day d
/// or d+1; <see cref="AnyAlert"/> when any alert did; <see cref="FirstFindings"/> lists the findings of the
/// first run from day d on that had any ("kind severity", "@d+1" when that run was the next day's).
/// </summary>
/// <param name="Severity">The worst expected-kind finding in the two checks; null when none.</param>
/// <param name="UnitCritical">Unit faults only: a slope_shift finding in the two checks was critical.</param>
/// <param name="UnitNamed">Unit faults only: a slope_shift finding's message names the factor (f, 1/f, or 1/f's decimal).</param>
internal sealed record FaultOutcome(
    FaultCase Fault,
    string Pair,
    string Host,
    string Storage,
    int Rows,
    bool Caught,
    int? CaughtOnDay,
    bool AnyAlert,
    IReadOnlyList<string> AlertKinds,
    Severity? Severity,
    IReadOnlyList<string> FirstFindings,
    bool? UnitCritical,
    bool? UnitNamed,
    int Unmeasured)
{
    public bool MeetsBar => Caught && (!Fault.IsUnit || (UnitCritical == true && UnitNamed == true));
}
