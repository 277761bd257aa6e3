using System.Collections.Concurrent;
using System.Security.Cryptography;

namespace DriftWatch.Dashboard.Access;

/// <summary>
/// Sign-in sessions, held in memory: a random 256-bit id per sign-in, valid for a fixed <see cref="Lifetime"/>
/// from the sign-in (not sliding: a stolen cookie stops working at a known time however much it is used) or
/// until <c>/logout</c> removes it. A restart of the worker ends every session; signing in again is one form.
/// </summary>
internal sealed class DashboardSessions(TimeProvider time)
{
    /// <summary>A working day.</summary>
    public static readonly TimeSpan Lifetime = TimeSpan.FromHours(12);

    /// <summary>Sessions need the token, so only its holders create them; the cap only bounds memory.</summary>
    public const int MaxSessions = 1000;

    private readonly ConcurrentDictionary<string, DateTimeOffset> _expires = new(StringComparer.Ordinal);

    public int Count => _expires.Count;

    /// <summary>A new session id (the cookie's value) and when it expires.</summary>
    public (string Id, DateTimeOffset Expires) Start()
    {
        var now = time.GetUtcNow();
        foreach (var (id, expires) in _expires)
        {
            if (expires <= now)
            {
                _expires.TryRemove(id, out _);
            }
        }

        while (_expires.Count >= MaxSessions && _expires.MinBy(s => s.Value) is { Key: { } oldest })
        {
            _expires.TryRemove(oldest, out _);
        }

        // 32 bytes of the operating system's CSPRNG: unguessable, so the lookup below needs no constant-time compare.
        var session = Convert.ToHexStringLower(RandomNumberGenerator.GetBytes(32));
        var until = now + Lifetime;
        _expires[session] = until;
        return (session, until);
    }

    public bool IsActive(string? id)
    {
        if (string.IsNullOrEmpty(id) || !_expires.TryGetValue(id, out var expires))
        {
            return false;
        }

        if (expires > time.GetUtcNow())
        {
            return true;
        }

        _expires.TryRemove(id, out _);
        return false;
    }

    /// <summary>Ends the session at once: the cookie is worthless from here on, wherever a copy of it is.</summary>
    public void End(string? id)
    {
        if (!string.IsNullOrEmpty(id))
        {
            _expires.TryRemove(id, out _);
        }
    }
}
