using System.Collections.Concurrent;
using System.Security.Cryptography;

namespace DriftWatch.Dashboard.Access;

/// <summary>
/// Sign-in sessions, held in memory: a random 256-bit id per sign-in, valid for a fixed <see cref="Lifetime"/>
/// from the sign-in (not sliding: a stolen cookie stops working at a known time however much it is used) or
/// until <c>/logout</c> removes it. A restart of the worker ends every session; signing in again is one form.
/// Each session carries the name its holder gave at sign-in (for the audit log) and its own random CSRF token,
/// which every action form repeats in a hidden field.
/// </summary>
internal sealed class DashboardSessions(TimeProvider time)
{
    /// <summary>A working day.</summary>
    public static readonly TimeSpan Lifetime = TimeSpan.FromHours(12);

    /// <summary>Sessions need the token, so only its holders create them; the cap only bounds memory.</summary>
    public const int MaxSessions = 1000;

    private readonly ConcurrentDictionary<string, DashboardSession> _expires = new(StringComparer.Ordinal);

    public int Count => _expires.Count;

    /// <summary>A new session id (the cookie's value) and when it expires.</summary>
    public (string Id, DateTimeOffset Expires) Start(string? name = null)
    {
        var now = time.GetUtcNow();
        foreach (var (id, held) in _expires)
        {
            if (held.Expires <= now)
            {
                _expires.TryRemove(id, out _);
            }
        }

        while (_expires.Count >= MaxSessions && _expires.MinBy(s => s.Value.Expires) is { Key: { } oldest })
        {
            _expires.TryRemove(oldest, out _);
        }

        // 32 bytes of the operating system's CSPRNG: unguessable, so the lookup below needs no constant-time compare.
        var session = Convert.ToHexStringLower(RandomNumberGenerator.GetBytes(32));
        var until = now + Lifetime;
        _expires[session] = new DashboardSession(until, name, Convert.ToHexStringLower(RandomNumberGenerator.GetBytes(32)));
        return (session, until);
    }

    public bool IsActive(string? id) => Get(id) is not null;

    /// <summary>The live session with this id; null when there is none or it has expired.</summary>
    public DashboardSession? Get(string? id)
    {
        if (string.IsNullOrEmpty(id) || !_expires.TryGetValue(id, out var session))
        {
            return null;
        }

        if (session.Expires > time.GetUtcNow())
        {
            return session;
        }

        _expires.TryRemove(id, out _);
        return null;
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
