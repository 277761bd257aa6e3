using DriftWatch.Core.Findings;

namespace DriftWatch.Core.Configuration;

public sealed record AlertingConfig
{
    public const int DefaultWarningPersistence = 2;
    public const int DefaultCriticalPersistence = 1;
    public const int DefaultCheckFailingAfter = 3;
    public const double DefaultFdrQ = 0.05;
    public static readonly TimeSpan DefaultRenotify = TimeSpan.FromHours(24);

    public IReadOnlyList<RouteConfig> Routes { get; init; } = [];

    public SmtpConfig? Smtp { get; init; }

    /// <summary>Consecutive runs a warning must persist before it fires.</summary>
    public int WarningPersistence { get; init; } = DefaultWarningPersistence;

    /// <summary>Consecutive runs a critical finding must persist before it fires.</summary>
    public int CriticalPersistence { get; init; } = DefaultCriticalPersistence;

    public TimeSpan Renotify { get; init; } = DefaultRenotify;

    /// <summary>Benjamini–Hochberg q over one cycle's p-value findings; null turns the step off.</summary>
    public double? FdrQ { get; init; } = DefaultFdrQ;

    /// <summary>Failed checks in a row before a check_failing alert is raised.</summary>
    public int CheckFailingAfter { get; init; } = DefaultCheckFailingAfter;

    /// <summary>Base URL of the dashboard for links in emails; null leaves links out.</summary>
    public Uri? PublicUrl { get; init; }
}

public enum ChannelKind
{
    Smtp,
    File,
}

public sealed record RouteConfig
{
    public required string Name { get; init; }

    public ChannelKind Channel { get; init; } = ChannelKind.Smtp;

    public IReadOnlyList<string> Recipients { get; init; } = [];

    public Severity MinSeverity { get; init; } = Severity.Warning;

    /// <summary>Only pairs carrying one of these tags; empty matches every pair.</summary>
    public IReadOnlyList<string> Tags { get; init; } = [];

    /// <summary>Inline scatter plots carry sampled data values out of the database; a route may turn them off.</summary>
    public bool IncludePlot { get; init; } = true;

    /// <summary>For the file channel: the folder .eml files are written to.</summary>
    public string? Directory { get; init; }
}

public enum SmtpSecurity
{
    StartTls,
    Tls,
    None,
}

public sealed record SmtpConfig
{
    public const int DefaultPort = 587;

    public required string Host { get; init; }

    public int Port { get; init; } = DefaultPort;

    public SmtpSecurity Security { get; init; } = SmtpSecurity.StartTls;

    public string? User { get; init; }

    /// <summary>Resolved from ${ENV} or a file; a secret.</summary>
    public string? Password { get; init; }

    public required string From { get; init; }

    public override string ToString() => $"{Host}:{Port} ({Security})";
}
