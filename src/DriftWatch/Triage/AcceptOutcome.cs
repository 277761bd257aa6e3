using DriftWatch.Core.History;

namespace DriftWatch.Triage;

/// <summary>How a request to accept a run as the baseline ended.</summary>
internal enum AcceptResult
{
    Accepted,

    /// <summary>No --run given and the pair has no recent successful run with sampled points.</summary>
    NoRun,

    /// <summary>The run id names no run of this pair.</summary>
    RunNotFound,

    /// <summary>The run failed, measured nothing, or its points were pruned: it cannot be pooled.</summary>
    RunNotUsable,

    /// <summary>The run had warning-or-worse findings and the request did not insist (--force).</summary>
    Refused,
}

/// <summary>The outcome of an accept, with the run it was about (when one was found) and the new baseline.</summary>
internal sealed record AcceptOutcome(AcceptResult Result, RunRecord? Run, StoredBaseline? Baseline, string Message);
