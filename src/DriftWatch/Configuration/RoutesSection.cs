using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;

namespace DriftWatch.Configuration;

/// <summary><c>alerting.routes:</c> who hears about which findings, and through which channel.</summary>
internal static class RoutesSection
{
    public static IReadOnlyList<RouteConfig> Read(MappingReader alerting, bool smtpGiven, out IReadOnlySet<string> declared)
    {
        var routes = new List<RouteConfig>();
        var seen = new Dictionary<string, long>(StringComparer.Ordinal);
        foreach (var (node, path) in alerting.Items("routes"))
        {
            var reader = MappingReader.OpenItem(alerting.Context, node, path, ConfigKeys.Route, "a route needs a name and a channel");
            if (reader is null)
            {
                continue;
            }

            var errorsBefore = alerting.Context.ErrorCount;
            var route = ReadRoute(reader, seen, smtpGiven);
            reader.Done();
            if (route is not null && alerting.Context.ErrorCount == errorsBefore)
            {
                routes.Add(route);
            }
        }

        declared = seen.Keys.ToHashSet(StringComparer.Ordinal);
        return routes;
    }

    private static RouteConfig? ReadRoute(MappingReader reader, Dictionary<string, long> seen, bool smtpGiven)
    {
        var name = NameSection.Read(reader, "route", seen);
        var channel = reader.Choice("channel", ("smtp", ChannelKind.Smtp), ("file", ChannelKind.File)) ?? ChannelKind.Smtp;
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

        var minSeverity = reader.Choice("min_severity", ("info", Severity.Info), ("warning", Severity.Warning), ("critical", Severity.Critical))
            ?? Severity.Warning;
        var tags = PairsSection.ReadTags(reader, "tags");
        var includePlot = reader.Bool("include_plot") ?? true;
        var directory = reader.Text("directory");
        if (channel == ChannelKind.Smtp)
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
            : new RouteConfig
            {
                Name = name,
                Channel = channel,
                Recipients = recipients,
                MinSeverity = minSeverity,
                Tags = tags,
                IncludePlot = includePlot,
                Directory = directory is null ? null : reader.Context.ResolvePath(directory),
            };
    }
}
