namespace DriftWatch.Triage;

/// <summary>Who acts and through what: a name typed at sign-in or given by a trusted proxy (dashboard), or the operating-system user (cli).</summary>
internal sealed record Actor(string Name, string Via)
{
    public const string ViaDashboard = "dashboard";
    public const string ViaCli = "cli";

    /// <summary>Names are shown in tables and mails: one line, bounded.</summary>
    public const int MaxNameLength = 100;

    /// <summary>The person running a CLI command, as the operating system knows them.</summary>
    public static Actor FromOperatingSystem() => new(Clean(Environment.UserName) ?? "unknown", ViaCli);

    public static Actor Dashboard(string name) => new(Clean(name) ?? throw new ArgumentException("A name is required.", nameof(name)), ViaDashboard);

    /// <summary>Trimmed, control characters dropped, cut to <see cref="MaxNameLength"/>; null when nothing is left.</summary>
    public static string? Clean(string? text)
    {
        if (text is null)
        {
            return null;
        }

        var kept = new string([.. text.Where(c => !char.IsControl(c))]).Trim();
        if (kept.Length > MaxNameLength)
        {
            kept = kept[..MaxNameLength].TrimEnd();
        }

        return kept.Length == 0 ? null : kept;
    }
}
