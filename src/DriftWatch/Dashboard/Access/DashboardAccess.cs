using System.Security.Cryptography;
using System.Text;
using DriftWatch.Core.Configuration;
using Microsoft.AspNetCore.Http;

namespace DriftWatch.Dashboard.Access;

/// <summary>
/// Who may read the dashboard. On a loopback address without a token: anyone on this machine, through a host
/// name of <see cref="HostAllowList"/>. Bound anywhere else a token is mandatory (refused at start-up without
/// one), and with a token every request must carry it as <c>Authorization: Bearer &lt;token&gt;</c> or hold the
/// cookie of a live session (<see cref="DashboardSessions"/>) the sign-in form started. Token comparisons take
/// constant time; failed sign-ins are limited per client (<see cref="LoginThrottle"/>).
/// </summary>
internal sealed class DashboardAccess
{
    public const string CookieName = "driftwatch_session";

    private readonly byte[]? _tokenHash;

    public DashboardAccess(DashboardConfig config, TimeProvider? time = null)
    {
        Validate(config);
        var bind = DashboardBinding.Parse(config.Bind);
        Loopback = DashboardBinding.IsLoopback(bind);

        if (!string.IsNullOrEmpty(config.AccessToken))
        {
            _tokenHash = SHA256.HashData(Encoding.UTF8.GetBytes(config.AccessToken));
        }

        UserHeader = string.IsNullOrEmpty(config.UserHeader) ? null : config.UserHeader;
        time ??= TimeProvider.System;
        Sessions = new DashboardSessions(time);
        Throttle = new LoginThrottle(time);
        // Without a token, the Host header is the only thing between a rebinding page and the data.
        Hosts = Loopback && _tokenHash is null ? new HostAllowList(bind) : null;
    }

    public bool Loopback { get; }

    /// <summary>Throws when the configuration binds beyond loopback without an access token.</summary>
    public static void Validate(DashboardConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        if (!DashboardBinding.IsLoopback(DashboardBinding.Parse(config.Bind)) && string.IsNullOrEmpty(config.AccessToken))
        {
            throw new InvalidOperationException(
                $"dashboard.bind '{config.Bind}' is reachable from other machines; set dashboard.access_token or bind to 127.0.0.1.");
        }
    }

    public bool TokenRequired => _tokenHash is not null;

    /// <summary>The header a trusted proxy names the user in (dashboard.user_header); null when none is configured, and then no header is read.</summary>
    public string? UserHeader { get; }

    /// <summary>The live session of this request's cookie, if any.</summary>
    public DashboardSession? SessionOf(HttpRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        return request.Cookies.TryGetValue(CookieName, out var cookie) ? Sessions.Get(cookie) : null;
    }

    /// <summary>
    /// Who is acting: the configured proxy header's value when there is one, else the name given at sign-in; null
    /// when neither names anyone.
    /// </summary>
    public string? ActorName(HttpRequest request, DashboardSession? session)
    {
        ArgumentNullException.ThrowIfNull(request);
        if (UserHeader is not null && Triage.Actor.Clean(request.Headers[UserHeader].ToString()) is { } proxied)
        {
            return proxied;
        }

        return session?.Name;
    }

    public DashboardSessions Sessions { get; }

    public LoginThrottle Throttle { get; }

    /// <summary>The names requests must carry in Host; null when any name is accepted (a token guards the dashboard).</summary>
    public HostAllowList? Hosts { get; }

    public bool IsAuthorized(HttpRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        if (_tokenHash is null)
        {
            return true;
        }

        var header = request.Headers.Authorization.ToString();
        if (header.StartsWith("Bearer ", StringComparison.OrdinalIgnoreCase) && CheckToken(header["Bearer ".Length..].Trim()))
        {
            return true;
        }

        return request.Cookies.TryGetValue(CookieName, out var cookie) && Sessions.IsActive(cookie);
    }

    // Hashing first makes the comparison constant-time in the length too: a wrong guess learns nothing, not even the token's length.
    public bool CheckToken(string? candidate) =>
        _tokenHash is not null && candidate is not null &&
        CryptographicOperations.FixedTimeEquals(SHA256.HashData(Encoding.UTF8.GetBytes(candidate)), _tokenHash);

    /// <summary>"localhost", 127.0.0.0/8, ::1 and their bracketed or IPv4-mapped forms are loopback; anything else (0.0.0.0, a LAN address, a host name) is not.</summary>
    public static bool IsLoopback(string bind) =>
        DashboardBinding.TryParse(bind, out var address) && DashboardBinding.IsLoopback(address);
}
