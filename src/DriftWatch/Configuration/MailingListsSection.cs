using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;

namespace DriftWatch.Configuration;

/// <summary><c>alerting.mailing_lists:</c> who hears about which findings, and through which channel.</summary>
internal static class MailingListsSection
{
    public static IReadOnlyList<MailingListConfig> Read(MappingReader alerting, bool smtpGiven, out IReadOnlySet<string> declared)
    {
        var lists = new List<MailingListConfig>();
        var seen = new Dictionary<string, long>(StringComparer.Ordinal);
        foreach (var (node, path) in alerting.Items("mailing_lists"))
        {
            var reader = MappingReader.OpenItem(alerting.Context, node, path, ConfigKeys.MailingList, "a mailing list needs a name and a channel");
            if (reader is null)
            {
                continue;
            }

            var errorsBefore = alerting.Context.ErrorCount;
            var list = ReadList(reader, seen, smtpGiven);
            reader.Done();
            if (list is not null && alerting.Context.ErrorCount == errorsBefore)
            {
                lists.Add(list);
            }
        }

        declared = seen.Keys.ToHashSet(StringComparer.Ordinal);
        return lists;
    }

    private static MailingListConfig? ReadList(MappingReader reader, Dictionary<string, long> seen, bool smtpGiven)
    {
        var name = NameSection.Read(reader, "mailing list", seen);
        var channel = reader.Choice("channel", ("smtp", ChannelKind.Smtp), ("file", ChannelKind.File), ("webhook", ChannelKind.Webhook)) ?? ChannelKind.Smtp;
        var recipients = new List<string>();
        foreach (var (text, at, path) in reader.TextList("recipients"))
        {
            if (Mail.CheckAddress(text) is { } problem)
            {
                reader.Context.Error(at, path, problem);
            }
            else
            {
                recipients.Add(text);
            }
        }

        var fromSeverity = reader.Choice("from_severity", ("info", Severity.Info), ("warning", Severity.Warning), ("critical", Severity.Critical))
            ?? Severity.Warning;
        var tags = PairsSection.ReadTags(reader, "tags");
        var includePlot = reader.Bool("include_plot") ?? true;
        var directory = reader.Text("directory");
        var webhook = WebhookKeys.Read(reader, channel);
        if (channel == ChannelKind.Webhook)
        {
            foreach (var key in (string[])["recipients", "directory", "include_plot"])
            {
                if (reader.Has(key))
                {
                    reader.Error(key, key == "include_plot"
                        ? "applies to the smtp and file channels only: a webhook never carries a plot (it links to the dashboard)"
                        : $"applies to the {(key == "directory" ? "file" : "smtp")} channel only");
                }
            }
        }
        else if (channel == ChannelKind.Smtp)
        {
            if (!smtpGiven)
            {
                reader.Error("channel", "is smtp but alerting.smtp is not set; add the server or use channel: file");
            }

            if (!reader.Has("recipients"))
            {
                reader.Missing("recipients", "is required for the smtp channel: one or more mail addresses");
            }

            if (directory is not null)
            {
                reader.Error("directory", "applies to the file channel only");
            }
        }
        else if (!reader.Has("directory"))
        {
            reader.Missing("directory", "is required for the file channel: the folder .eml files are written to");
        }

        return name is null
            ? null
            : new MailingListConfig
            {
                Name = name,
                Channel = channel,
                Recipients = recipients,
                FromSeverity = fromSeverity,
                Tags = tags,
                IncludePlot = includePlot,
                Directory = directory is null ? null : reader.Context.ResolvePath(directory),
                Url = webhook.Url,
                Secret = webhook.Secret,
                Format = webhook.Format,
                Timeout = webhook.Timeout,
            };
    }
}
