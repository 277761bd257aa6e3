using System.Threading.Channels;

namespace DriftWatch.Alerting.Outbox;

/// <summary>Wakes the dispatcher when a cycle has queued messages, so alerts do not wait for the next poll.</summary>
internal sealed class OutboxSignal
{
    // Capacity one, extra writes dropped: many cycles in a row still mean one pass.
    private readonly Channel<bool> _wakeUps = Channel.CreateBounded<bool>(new BoundedChannelOptions(1) { FullMode = BoundedChannelFullMode.DropWrite });

    public void Notify() => _wakeUps.Writer.TryWrite(true);

    /// <summary>Returns when notified or after <paramref name="timeout"/>.</summary>
    public async Task WaitAsync(TimeSpan timeout, TimeProvider time, CancellationToken cancellationToken)
    {
        using var linked = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        var delay = Task.Delay(timeout, time, linked.Token);
        var wake = _wakeUps.Reader.WaitToReadAsync(linked.Token).AsTask();
        await Task.WhenAny(delay, wake);
        await linked.CancelAsync();
        _wakeUps.Reader.TryRead(out _);
        cancellationToken.ThrowIfCancellationRequested();
    }
}
