namespace DriftWatch.Core.Configuration;

public sealed record DashboardConfig
{
    public const string DefaultBind = "127.0.0.1";
    public const int DefaultPort = 8087;

    public bool Enabled { get; init; } = true;

    public string Bind { get; init; } = DefaultBind;

    public int Port { get; init; } = DefaultPort;

    /// <summary>Required when <see cref="Bind"/> is not a loopback address. A secret.</summary>
    public string? AccessToken { get; init; }

    /// <summary>
    /// A request header a trusted reverse proxy sets to the signed-in user's name (for the audit log of triage
    /// actions). Honoured only when configured; null reads no header.
    /// </summary>
    public string? UserHeader { get; init; }
}
