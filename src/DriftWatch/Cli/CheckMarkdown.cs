using System.Text;
using DriftWatch.Alerting.Digest;
using DriftWatch.Core.History;
using DriftWatch.Monitoring;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>
/// <c>check --format markdown</c>: a summary for a CI job's page (GitHub-flavoured Markdown): a heading, one line of
/// totals, one table row per pair, what failed the step, and the cautions. Every text taken from the configuration or
/// a database goes through <see cref="Cell"/> or <see cref="Text"/>, so a pair name can neither break the table nor
/// inject markup.
/// </summary>
internal static class CheckMarkdown
{
    public const string Heading = "## DriftWatch check";

    public static string Write(CheckTally tally, Uri? dashboard)
    {
        ArgumentNullException.ThrowIfNull(tally);
        var md = new StringBuilder();
        md.Append(Heading).Append("\n\n");
        md.Append(Totals(tally)).Append("\n\n");
        md.Append("| pair | status | r baseline → now | findings |\n");
        md.Append("|---|---|---|---|\n");
        foreach (var result in tally.Results)
        {
            md.Append("| ").Append(PairCell(result, dashboard))
                .Append(" | ").Append(StatusCell(tally, result))
                .Append(" | ").Append(Cell(CheckTally.CorrelationMove(result)))
                .Append(" | ").Append(FindingsCell(result))
                .Append(" |\n");
        }

        var details = Details(tally);
        if (details.Length > 0)
        {
            md.Append('\n').Append(details);
        }

        md.Append("\n> ").Append(Text(Cautions.SignalsNotProof));
        if (dashboard is not null)
        {
            md.Append(" The dashboard's pages show plots, which carry sampled data values out of the database.");
        }

        md.Append('\n');
        return md.ToString();
    }

    /// <summary>"**3 pairs** checked at …: 1 passing, 1 failing (a finding at warning or worse), 1 not measured. Exit code 1."</summary>
    private static string Totals(CheckTally tally) =>
        $"**{tally.Results.Count} pair{(tally.Results.Count == 1 ? "" : "s")}** checked at {Figures.Time(tally.StartedAt)}: " +
        $"{tally.Passing} passing, {tally.Failing} failing (a finding at {JsonContract.Name(tally.FailAt)} or worse), " +
        $"{tally.NotMeasured} not measured. Exit code {tally.ExitCode}.";

    private static string PairCell(PairCheckResult result, Uri? dashboard)
    {
        var name = Cell(result.Pair.Name);
        // Pointy brackets keep any character of the address inside the link (CommonMark, link destinations).
        return DigestComposer.DashboardUrl(dashboard, result.Pair.Name) is { } url ? $"[{name}](<{url}>)" : name;
    }

    private static string StatusCell(CheckTally tally, PairCheckResult result)
    {
        var word = RunStatusText.Word(result.Status);
        if (CheckTally.IsNotMeasured(result))
        {
            return "**" + word + "**";
        }

        var verdict = tally.Failures(result).Count > 0 ? "failing" : "passing";
        return result.HasBaseline ? $"{word}, {verdict}" : $"{word}, {verdict} (no baseline yet)";
    }

    /// <summary>Worst first, one per line.</summary>
    private static string FindingsCell(PairCheckResult result)
    {
        if (result.Findings.Count == 0)
        {
            return CheckTally.IsNotMeasured(result) ? Cell(result.Error ?? "—") : "none";
        }

        return string.Join("<br>", result.Findings.OrderByDescending(f => f.Severity).Select(f => Cell(CheckTally.Headline(f))));
    }

    /// <summary>What failed the step, with the findings' messages: the table has room for headlines only.</summary>
    private static string Details(CheckTally tally)
    {
        var md = new StringBuilder();
        foreach (var result in tally.Results)
        {
            var failures = tally.Failures(result);
            if (CheckTally.IsNotMeasured(result))
            {
                md.Append("- **").Append(Text(result.Pair.Name)).Append("** ").Append(RunStatusText.Word(result.Status))
                    .Append(": ").Append(Text(result.Error ?? "no reason recorded")).Append('\n');
            }
            else if (failures.Count > 0)
            {
                md.Append("- **").Append(Text(result.Pair.Name)).Append("** (").Append(Text(result.Pair.X)).Append(" vs ")
                    .Append(Text(result.Pair.Y)).Append("): ").Append(Text(CheckTally.KeyFigures(result))).Append('\n');
                foreach (var finding in failures)
                {
                    md.Append("  - ").Append(Text(CheckTally.Headline(finding))).Append(": ").Append(Text(finding.Message)).Append('\n');
                }
            }
        }

        return md.Length == 0 ? string.Empty : "### What failed the step\n\n" + md;
    }

    /// <summary>
    /// Text in a table cell. GitHub Flavored Markdown Spec 0.29-gfm, 4.10 (tables): a cell ends at an unescaped
    /// <c>|</c>, even inside a code span, and a row ends at a line break, so <c>|</c> becomes <c>\|</c> and line breaks
    /// become <c>&lt;br&gt;</c>; everything else as <see cref="Text"/>.
    /// </summary>
    public static string Cell(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        return string.Join("<br>", Lines(Escape(text)));
    }

    /// <summary>
    /// Inline text shown as written. CommonMark 0.29, 2.4 (backslash escapes): any ASCII punctuation may be escaped;
    /// these are the characters that start a code span, emphasis, a link, raw HTML or an entity, or end a table cell.
    /// A line break inside a list item would end the item: it becomes a space; other control characters become U+FFFD.
    /// </summary>
    public static string Text(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        return string.Join(' ', Lines(Escape(text)));
    }

    private static string[] Lines(string text) => text.ReplaceLineEndings("\n").Split('\n');

    private static string Escape(string text)
    {
        var md = new StringBuilder(text.Length + 8);
        foreach (var c in text)
        {
            // Control characters (a database's error can carry one) have no meaning to a reader: shown as U+FFFD,
            // as CommonMark does for U+0000 (2.3, insecure characters).
            if (char.IsControl(c) && c is not ('\t' or '\n' or '\r'))
            {
                md.Append('\uFFFD');
                continue;
            }

            if (c is '\\' or '`' or '*' or '_' or '[' or ']' or '<' or '>' or '|' or '~' or '&' or '!')
            {
                md.Append('\\');
            }

            md.Append(c);
        }

        return md.ToString();
    }
}
