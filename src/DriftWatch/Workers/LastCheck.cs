namespace DriftWatch.Workers;

/// <summary>The pair this worker checked last and when the check started; the heartbeat carries it to the store.</summary>
internal sealed class LastCheck
{
    private Entry? _last;

    public (string Pair, DateTimeOffset At)? Current => Volatile.Read(ref _last) is { } e ? (e.Pair, e.At) : null;

    public void Started(string pair, DateTimeOffset at) => Volatile.Write(ref _last, new Entry(pair, at));

    private sealed record Entry(string Pair, DateTimeOffset At);
}
