using System.Text;
using DriftWatch.Core.Alerting;
using DriftWatch.Output;

namespace DriftWatch.Alerting.Digest;

/// <summary>The plain-text alternative: the same content as the HTML, minus the images.</summary>
internal static class DigestPlainText
{
    public static string Render(DigestModel model)
    {
        var items = model.Sections.SelectMany(s => s.Items).ToArray();
        var text = new StringBuilder(4 * 1024);
        text.Append("DriftWatch · mailing list ").Append(model.MailingList).Append(" · ").Append(Figures.Time(model.At)).Append('\n')
            .Append(DigestCautions.Summary(items)).Append("\n\n");

        foreach (var section in model.Sections)
        {
            text.Append("== ").Append(section.Pair).Append(" ==\n")
                .Append(section.SourceLine).Append('\n');
            foreach (var item in section.Items)
            {
                var badge = item.IsActive ? AlertWording.SeverityLabel(item.Alert.Severity) : "CLEARED";
                text.Append("  [").Append(badge).Append("] ");
                if (item.IsActive)
                {
                    text.Append(AlertWording.Transition(item.Notification.Kind)).Append(" · ");
                }

                text.Append(AlertWording.Phrase(item.Alert.Kind)).Append(": ").Append(item.Alert.Message);
                if (item.Notification.Kind is NotificationKind.Reminder or NotificationKind.Escalated && item.Alert.ConfirmedAt is { } confirmed)
                {
                    text.Append(" (confirmed since ").Append(Figures.Time(confirmed)).Append(')');
                }

                if (item.Alert.Id > 0)
                {
                    text.Append(" (alert #").Append(item.Alert.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)).Append(')');
                }

                text.Append('\n');
            }

            if (section.Equation is { } equation)
            {
                text.Append("  y is an exact function of x in the current sample: ").Append(equation).Append('\n');
            }

            Table(text, section);
            if (section.PlotContentId is not null)
            {
                text.Append("  Scatter plot: in the HTML version of this message.\n");
            }
            else if (section.PlotNote is { } note)
            {
                text.Append("  ").Append(note).Append('\n');
            }

            if (section.DashboardUrl is { } url)
            {
                text.Append("  Dashboard: ").Append(url).Append('\n')
                    .Append("  Acknowledge, snooze or accept a baseline (dashboard sign-in needed): ").Append(url).Append("#triage\n");
            }

            text.Append('\n');
        }

        text.Append("----\n").Append(DigestCautions.Signals).Append('\n');
        if (model.CarriesPlots)
        {
            text.Append(DigestCautions.SampledValues).Append('\n');
        }

        return text.ToString();
    }

    private static void Table(StringBuilder text, PairSection section)
    {
        var rows = DigestFigures.Rows(section.Context);
        var nameWidth = rows.Max(r => r.Name.Length);
        var valueWidth = Math.Max(8, rows.Max(r => Math.Max(r.Baseline.Length, r.Current.Length)));
        text.Append("  ").Append(new string(' ', nameWidth)).Append("  ").Append("baseline".PadLeft(valueWidth)).Append("  ").Append("current".PadLeft(valueWidth)).Append('\n');
        foreach (var row in rows)
        {
            text.Append("  ").Append(row.Name.PadRight(nameWidth)).Append("  ").Append(row.Baseline.PadLeft(valueWidth)).Append("  ").Append(row.Current.PadLeft(valueWidth)).Append('\n');
        }
    }
}
