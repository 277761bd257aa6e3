using System.Net;

namespace DriftWatch.Dashboard.Access;

/// <summary>
/// At most <see cref="MaxFailures"/> failed sign-ins per client address in any <see cref="Window"/>; past that,
/// every attempt from the address (right or wrong) is refused until the oldest failure leaves the window, so
/// the answer never tells a guesser which guess was right. Behind a reverse proxy every client shares the
/// proxy's address, and so its limit.
/// </summary>
internal sealed class LoginThrottle(TimeProvider time)
{
    public const int MaxFailures = 10;

    public static readonly TimeSpan Window = TimeSpan.FromMinutes(1);

    /// <summary>Bounds memory under a flood from many addresses: beyond it, addresses with no recent failure are dropped first.</summary>
    public const int MaxClients = 10_000;

    private readonly Dictionary<IPAddress, Queue<DateTimeOffset>> _failures = [];
    private readonly Lock _lock = new();

    /// <summary>How long the client must wait before its next attempt; null when it may try now.</summary>
    public TimeSpan? RetryAfter(IPAddress? client)
    {
        var now = time.GetUtcNow();
        lock (_lock)
        {
            if (!_failures.TryGetValue(Key(client), out var failures))
            {
                return null;
            }

            Forget(failures, now);
            return failures.Count >= MaxFailures ? failures.Peek() + Window - now : null;
        }
    }

    public void Failed(IPAddress? client)
    {
        var now = time.GetUtcNow();
        lock (_lock)
        {
            if (_failures.Count >= MaxClients)
            {
                foreach (var (address, queue) in _failures)
                {
                    Forget(queue, now);
                    if (queue.Count == 0)
                    {
                        _failures.Remove(address);
                    }
                }
            }

            var key = Key(client);
            if (!_failures.TryGetValue(key, out var failures))
            {
                if (_failures.Count >= MaxClients)
                {
                    // Every slot holds a recent failure: the newcomer shares the "unknown" slot rather than grow the table.
                    key = IPAddress.None;
                    failures = _failures.GetValueOrDefault(key);
                }

                if (failures is null)
                {
                    failures = new Queue<DateTimeOffset>();
                    _failures[key] = failures;
                }
            }

            Forget(failures, now);
            failures.Enqueue(now);
            while (failures.Count > MaxFailures)
            {
                failures.Dequeue();
            }
        }
    }

    private static void Forget(Queue<DateTimeOffset> failures, DateTimeOffset now)
    {
        while (failures.Count > 0 && failures.Peek() + Window <= now)
        {
            failures.Dequeue();
        }
    }

    private static IPAddress Key(IPAddress? client) =>
        client is null ? IPAddress.None : client.IsIPv4MappedToIPv6 ? client.MapToIPv4() : client;
}
