namespace DriftWatch.Scheduling;

/// <summary>
/// How many pair checks this worker is running now. The check that brings the count back to zero asks for an
/// alert evaluation, so the pairs of one schedule slot are judged together (one false-discovery family).
/// </summary>
internal sealed class RunningChecks
{
    private int _count;

    public void Started() => Interlocked.Increment(ref _count);

    /// <summary>True when this was the last check running.</summary>
    public bool Finished() => Interlocked.Decrement(ref _count) == 0;
}
