namespace DriftWatch.Dashboard.Data;

/// <summary>
/// Where a pair stands, worst first: the overview sorts by this order. Serialised in snake_case
/// ("no_baseline").
/// </summary>
internal enum PairStatus
{
    /// <summary>An alert of warning or worse is confirmed: people were (or would have been) told.</summary>
    Confirmed,

    /// <summary>The latest check failed: the pair is not being watched right now.</summary>
    Failing,

    /// <summary>The latest check ran but had nothing to measure (no rows, too few usable rows, a constant column).</summary>
    Unmeasurable,

    /// <summary>A warning or worse was seen but not yet in enough runs in a row to be confirmed.</summary>
    Watching,

    /// <summary>Checks run, but there is nothing to compare with yet (or the baseline was reset).</summary>
    NoBaseline,

    /// <summary>Configured, never checked.</summary>
    NoRuns,

    /// <summary>Latest check succeeded, a baseline exists and no alert of warning or worse is open.</summary>
    Healthy,
}
