namespace DriftWatch.Benchmarks.Cycle;

/// <summary>
/// The system clock moved so that the benchmark starts at a fixed instant: the generated tables end at that
/// instant, so a windowed pair always finds the same rows in its window however old the database is, while
/// time still advances between checks as it does in the worker.
/// </summary>
internal sealed class ShiftedClock(DateTimeOffset start) : TimeProvider
{
    private readonly DateTimeOffset _realStart = System.GetUtcNow();

    public override DateTimeOffset GetUtcNow() => start + (System.GetUtcNow() - _realStart);
}
