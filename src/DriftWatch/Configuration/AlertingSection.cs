using System.Globalization;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary><c>alerting:</c> mailing lists, the SMTP server, confirm runs, reminders, FDR control and links.</summary>
internal static class AlertingSection
{
    public const int MaxConfirmRuns = 100;
    public static readonly TimeSpan MaxRemindEvery = TimeSpan.FromDays(365);

    public static AlertingConfig Read(MappingReader? reader, out IReadOnlySet<string> declaredLists)
    {
        var defaults = new AlertingConfig();
        if (reader is null)
        {
            declaredLists = new HashSet<string>(StringComparer.Ordinal);
            return defaults;
        }

        var smtp = SmtpSection.Read(reader.Mapping("smtp", ConfigKeys.Smtp));
        var lists = MailingListsSection.Read(reader, smtpGiven: reader.Has("smtp"), out declaredLists);
        var warning = reader.Int("warning_confirm_runs", 1, MaxConfirmRuns) ?? defaults.WarningConfirmRuns;
        var critical = reader.Int("critical_confirm_runs", 1, MaxConfirmRuns) ?? defaults.CriticalConfirmRuns;
        var remindEvery = reader.Duration("remind_every", TimeSpan.FromMinutes(1), MaxRemindEvery) ?? defaults.RemindEvery;
        var fdrQ = ReadFdrQ(reader, defaults.FdrQ);
        var failingAfter = reader.Int("check_failing_after", 1, MaxConfirmRuns) ?? defaults.CheckFailingAfter;
        var publicUrl = ReadPublicUrl(reader);
        reader.Done();
        return defaults with
        {
            MailingLists = lists,
            Smtp = smtp,
            WarningConfirmRuns = warning,
            CriticalConfirmRuns = critical,
            RemindEvery = remindEvery,
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
