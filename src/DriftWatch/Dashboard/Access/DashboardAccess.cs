using System.Net;
using System.Security.Cryptography;
using System.Text;
using DriftWatch.Core.Configuration;
using Microsoft.AspNetCore.Http;

namespace DriftWatch.Dashboard.Access;

/// <summary>
/// Who may read the dashboard. On a loopback address without a token: anyone on this machine. Bound anywhere
/// else a token is mandatory (refused at start-up without one), and with a token every request must carry it
/// as <c>Authorization: Bearer &lt;token&gt;</c> or hold the session cookie the login form sets. The cookie holds
/// an HMAC of the token, not the token itself, and comparisons take constant time.
/// </summary>
internal sealed class DashboardAccess
{
    public const string CookieName = "driftwatch_session";

    private readonly byte[]? _token;
    private readonly string? _session;

    public DashboardAccess(DashboardConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        Loopback = IsLoopback(config.Bind);
        if (!Loopback && string.IsNullOrEmpty(config.AccessToken))
        {
            throw new InvalidOperationException(
                $"dashboard.bind '{config.Bind}' is reachable from other machines; set dashboard.access_token or bind to 127.0.0.1.");
        }

        if (!string.IsNullOrEmpty(config.AccessToken))
        {
            _token = Encoding.UTF8.GetBytes(config.AccessToken);
            _session = Convert.ToHexStringLower(HMACSHA256.HashData(_token, "driftwatch dashboard session v1"u8));
        }
    }

    public bool Loopback { get; }

    public bool TokenRequired => _token is not null;

    /// <summary>The cookie value that proves a past sign-in; null when no token is configured.</summary>
    public string? SessionValue => _session;

    public bool IsAuthorized(HttpRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        if (_token is null)
        {
            return true;
        }

        var header = request.Headers.Authorization.ToString();
        if (header.StartsWith("Bearer ", StringComparison.OrdinalIgnoreCase) && CheckToken(header["Bearer ".Length..].Trim()))
        {
            return true;
        }

        return request.Cookies.TryGetValue(CookieName, out var cookie) && FixedTimeEquals(cookie, _session!);
    }

    // Hashing first makes the comparison constant-time in the length too: a wrong guess learns nothing, not even the token's length.
    public bool CheckToken(string? candidate) =>
        _token is not null && candidate is not null &&
        CryptographicOperations.FixedTimeEquals(SHA256.HashData(Encoding.UTF8.GetBytes(candidate)), SHA256.HashData(_token));

    /// <summary>"localhost", 127.0.0.0/8 and ::1 are loopback; anything else (0.0.0.0, a LAN address, a host name) is not.</summary>
    public static bool IsLoopback(string bind)
    {
        if (string.Equals(bind, "localhost", StringComparison.OrdinalIgnoreCase))
        {
            return true;
        }

        return IPAddress.TryParse(bind.Trim('[', ']'), out var address) && IPAddress.IsLoopback(address);
    }

    private static bool FixedTimeEquals(string a, string b) =>
        CryptographicOperations.FixedTimeEquals(Encoding.UTF8.GetBytes(a), Encoding.UTF8.GetBytes(b));
}
