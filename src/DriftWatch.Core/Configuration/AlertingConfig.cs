using DriftWatch.Core.Findings;

namespace DriftWatch.Core.Configuration;

public sealed record AlertingConfig
{
    public const int DefaultWarningConfirmRuns = 2;
    public const int DefaultCriticalConfirmRuns = 1;
    public const int DefaultCheckFailingAfter = 3;
    public const double DefaultFdrQ = 0.05;
    public static readonly TimeSpan DefaultRemindEvery = TimeSpan.FromHours(24);

    /// <summary>Who hears about which alerts: each list gets one digest per cycle.</summary>
    public IReadOnlyList<MailingListConfig> MailingLists { get; init; } = [];

    public SmtpConfig? Smtp { get; init; }

    /// <summary>Runs in a row that must carry a warning before it is confirmed and people are told.</summary>
    public int WarningConfirmRuns { get; init; } = DefaultWarningConfirmRuns;

    /// <summary>Runs in a row that must carry a critical finding before it is confirmed and people are told.</summary>
    public int CriticalConfirmRuns { get; init; } = DefaultCriticalConfirmRuns;

    /// <summary>How long a confirmed, unacknowledged alert waits between reminders.</summary>
    public TimeSpan RemindEvery { get; init; } = DefaultRemindEvery;

    /// <summary>Benjamini–Hochberg q over one cycle's p-value findings; null turns the step off.</summary>
    public double? FdrQ { get; init; } = DefaultFdrQ;

    /// <summary>Failed or unmeasurable checks in a row before a check_failing alert is confirmed.</summary>
    public int CheckFailingAfter { get; init; } = DefaultCheckFailingAfter;

    /// <summary>Base URL of the dashboard for links in emails; null leaves links out.</summary>
    public Uri? PublicUrl { get; init; }
}

public enum ChannelKind
{
    Smtp,
    File,
    Webhook,
}

/// <summary>What a webhook mailing list posts: DriftWatch's full JSON document, or a short text form for chat tools.</summary>
public enum WebhookFormat
{
    Full,
    Text,
}

/// <summary>One mailing list: its recipients (or, for the file channel, a folder) and the alerts it takes.</summary>
public sealed record MailingListConfig
{
    public static readonly TimeSpan DefaultWebhookTimeout = TimeSpan.FromSeconds(10);

    public required string Name { get; init; }

    public ChannelKind Channel { get; init; } = ChannelKind.Smtp;

    public IReadOnlyList<string> Recipients { get; init; } = [];

    /// <summary>The lowest severity this list hears about.</summary>
    public Severity FromSeverity { get; init; } = Severity.Warning;

    /// <summary>Only pairs carrying one of these tags; empty matches every pair.</summary>
    public IReadOnlyList<string> Tags { get; init; } = [];

    /// <summary>Inline scatter plots carry sampled data values out of the database; a mailing list may turn them off.</summary>
    public bool IncludePlot { get; init; } = true;

    /// <summary>For the file channel: the folder .eml files are written to.</summary>
    public string? Directory { get; init; }

    /// <summary>For the webhook channel: where each digest is posted (https, or http to a loopback address).</summary>
    public Uri? Url { get; init; }

    /// <summary>For the webhook channel: the HMAC-SHA256 key that signs each post. Resolved from ${ENV} or a file; a secret.</summary>
    public string? Secret { get; init; }

    /// <summary>For the webhook channel: the body's form.</summary>
    public WebhookFormat Format { get; init; } = WebhookFormat.Full;

    /// <summary>For the webhook channel: how long one post may take, connection included, before it counts as the receiver being down.</summary>
    public TimeSpan Timeout { get; init; } = DefaultWebhookTimeout;

    /// <summary>Name and channel only: the URL may hold a token and the secret is one.</summary>
    public override string ToString() => $"{Name} ({Channel})";
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

    /// <summary>
    /// Full path of a PEM file of certificate authorities the server's certificate must chain to (a private CA);
    /// null trusts the operating system's roots.
    /// </summary>
    public string? CaFile { get; init; }

    public string? User { get; init; }

    /// <summary>Resolved from ${ENV} or a file; a secret.</summary>
    public string? Password { get; init; }

    public required string From { get; init; }

    public override string ToString() => $"{Host}:{Port} ({Security})";
}
