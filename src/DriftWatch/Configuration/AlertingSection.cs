using System.Globalization;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary><c>alerting:</c> routes, the SMTP server, persistence, renotify, FDR control and links.</summary>
internal static class AlertingSection
{
    public const int MaxPersistence = 100;
    public static readonly TimeSpan MaxRenotify = TimeSpan.FromDays(365);

    public static AlertingConfig Read(MappingReader? reader, out IReadOnlySet<string> declaredRoutes)
    {
        var defaults = new AlertingConfig();
        if (reader is null)
        {
            declaredRoutes = new HashSet<string>(StringComparer.Ordinal);
            return defaults;
        }

        var smtp = SmtpSection.Read(reader.Mapping("smtp", ConfigKeys.Smtp));
        var routes = RoutesSection.Read(reader, smtpGiven: reader.Has("smtp"), out declaredRoutes);
        var persistence = reader.Mapping("persistence", ConfigKeys.Persistence);
        var warning = persistence?.Int("warning", 1, MaxPersistence) ?? defaults.WarningPersistence;
        var critical = persistence?.Int("critical", 1, MaxPersistence) ?? defaults.CriticalPersistence;
        persistence?.Done();
        var renotify = reader.Duration("renotify", TimeSpan.FromMinutes(1), MaxRenotify) ?? defaults.Renotify;
        var fdrQ = ReadFdrQ(reader, defaults.FdrQ);
        var failingAfter = reader.Int("check_failing_after", 1, MaxPersistence) ?? defaults.CheckFailingAfter;
        var publicUrl = ReadPublicUrl(reader);
        reader.Done();
        return defaults with
        {
            Routes = routes,
            Smtp = smtp,
            WarningPersistence = warning,
            CriticalPersistence = critical,
            Renotify = renotify,
            FdrQ = fdrQ,
            CheckFailingAfter = failingAfter,
            PublicUrl = publicUrl,
        };
    }

    /// <summary>A q in (0, 1), or <c>off</c> for no false-discovery-rate step.</summary>
    private static double? ReadFdrQ(MappingReader reader, double? fallback)
    {
        var text = reader.Text("fdr_q");
        if (text is null)
        {
            return fallback;
        }

        if (text is "off" or "Off" or "OFF")
        {
            return null;
        }

        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var q) || !NumberRange.OpenUnit.Contains(q))
        {
            reader.Error("fdr_q", $"must be a number between 0 and 1, exclusive, or off; was '{text}'");
            return fallback;
        }

        return q;
    }

    private static Uri? ReadPublicUrl(MappingReader reader)
    {
        var text = reader.Text("public_url");
        if (text is null)
        {
            return null;
        }

        if (!Uri.TryCreate(text, UriKind.Absolute, out var uri) || (uri.Scheme != Uri.UriSchemeHttp && uri.Scheme != Uri.UriSchemeHttps))
        {
            reader.Error("public_url", $"must be an absolute http:// or https:// address, was '{text}'");
            return null;
        }

        return uri;
    }
}
