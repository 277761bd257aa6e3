using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard;

namespace DriftWatch.Configuration;

/// <summary><c>dashboard:</c> the history web UI. Reachable from other machines only with an access token.</summary>
internal static class DashboardSection
{
    /// <summary>A token shorter than this is guessable; 16 characters of a random generator are not.</summary>
    public const int MinAccessTokenLength = 16;

    public static DashboardConfig Read(MappingReader? reader)
    {
        var defaults = new DashboardConfig();
        if (reader is null)
        {
            return defaults;
        }

        var enabled = reader.Bool("enabled") ?? defaults.Enabled;
        var bind = reader.Text("bind") ?? defaults.Bind;
        var port = reader.Int("port", 1, 65_535) ?? defaults.Port;
        var token = reader.Text("access_token", secret: true);
        var userHeader = reader.Text("user_header");
        reader.Done();
        if (userHeader is not null && !IsHeaderName(userHeader))
        {
            reader.Error("user_header", $"must be an HTTP header name (letters, digits and - only, e.g. X-Forwarded-User), was '{userHeader}'");
            userHeader = null;
        }

        // Read once into an address (brackets, localhost and IPv4-mapped forms normalised); the config keeps
        // its canonical text, so the dashboard binds exactly what was validated here.
        var valid = DashboardBinding.TryParse(bind, out var address);
        var loopback = valid && DashboardBinding.IsLoopback(address);
        if (!valid)
        {
            reader.Error("bind", $"must be an IP address (127.0.0.1, ::1, 0.0.0.0, ::) or localhost, was '{bind}'");
        }

        if (token is not null && token.Length < MinAccessTokenLength)
        {
            reader.Error("access_token", $"is too short: at least {MinAccessTokenLength} characters (value hidden)");
        }

        if (enabled && valid && !loopback && token is null && !reader.Has("access_token"))
        {
            reader.Error("bind", $"'{bind}' is reachable from other machines; set dashboard.access_token (e.g. ${{DRIFTWATCH_DASHBOARD_TOKEN}}) or bind to 127.0.0.1");
        }

        return new DashboardConfig { Enabled = enabled, Bind = valid ? address.ToString() : bind, Port = port, AccessToken = token, UserHeader = userHeader };
    }

    // Stricter than RFC 9110's token on purpose: proxies' user headers are letters, digits and dashes.
    private static bool IsHeaderName(string name) =>
        name.Length is > 0 and <= 100 && name.All(c => char.IsAsciiLetterOrDigit(c) || c == '-');
}
