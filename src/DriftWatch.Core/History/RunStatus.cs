namespace DriftWatch.Core.History;

/// <summary>How a check ended. Stored and printed in snake_case ("unmeasurable").</summary>
public enum RunStatus
{
    /// <summary>The pair was sampled and measured; its findings (or none) are the result.</summary>
    Succeeded,

    /// <summary>The check could not run (source unreachable, query error, internal fault).</summary>
    Failed,

    /// <summary>
    /// The check ran but the window held nothing to measure (no rows, too few usable rows, a constant column):
    /// not health. Counts toward check_failing like a failure and never clears an alert.
    /// </summary>
    Unmeasurable,

    /// <summary>
    /// The check started but its process ended before it could finish or record anything (a crash, a kill, a power
    /// cut); recorded at the worker's next start from the marker the check left. Says nothing about the pair: it
    /// counts toward check_failing like a failure and never clears an alert.
    /// </summary>
    Interrupted,
}
