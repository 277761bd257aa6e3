using System.Globalization;
using System.Text;
using System.Xml;
using DriftWatch.Monitoring;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>
/// <c>check --format junit</c>: JUnit XML, the test-report format CI servers read (common practice: the layout of
/// Ant's JUnit report, which CI servers and test runners accept). One test suite for the pass, one test case per pair:
/// findings at <c>--fail-at</c> or worse are its &lt;failure&gt;, a check that failed, measured nothing or was cut off
/// is its &lt;error&gt;, lower findings and the key figures go to its &lt;system-out&gt;. Written with
/// <see cref="XmlWriter"/>, which escapes; characters XML 1.0 cannot carry at all are replaced first.
/// </summary>
internal static class CheckJunit
{
    public const string SuiteName = "driftwatch check";

    public static string Write(CheckTally tally)
    {
        ArgumentNullException.ThrowIfNull(tally);
        var settings = new XmlWriterSettings
        {
            Indent = true,
            Encoding = new UTF8Encoding(encoderShouldEmitUTF8Identifier: false),
            NewLineChars = "\n",
        };
        using var stream = new MemoryStream();
        using (var xml = XmlWriter.Create(stream, settings))
        {
            xml.WriteStartDocument();
            xml.WriteStartElement("testsuites");
            xml.WriteAttributeString("name", SuiteName);
            Counts(xml, tally);
            xml.WriteStartElement("testsuite");
            xml.WriteAttributeString("name", SuiteName);
            Counts(xml, tally);
            xml.WriteAttributeString("skipped", "0");
            // Ant's format: local time without a zone; ours is UTC, as every DriftWatch time is.
            xml.WriteAttributeString("timestamp", tally.StartedAt.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss", CultureInfo.InvariantCulture));
            xml.WriteStartElement("properties");
            Property(xml, "driftwatch.fail_at", JsonContract.Name(tally.FailAt));
            Property(xml, "driftwatch.exit_code", tally.ExitCode.ToString(CultureInfo.InvariantCulture));
            xml.WriteEndElement();
            foreach (var result in tally.Results)
            {
                TestCase(xml, tally, result);
            }

            xml.WriteElementString("system-out", Cautions.SignalsNotProof);
            xml.WriteEndElement();
            xml.WriteEndElement();
            xml.WriteEndDocument();
        }

        return Encoding.UTF8.GetString(stream.ToArray());
    }

    /// <summary>"source.table" (or "source.query"): CI servers group test cases by this, like packages.</summary>
    public static string ClassName(PairCheckResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        return result.Pair.Source + "." + (result.Pair.Table ?? "query");
    }

    private static void Counts(XmlWriter xml, CheckTally tally)
    {
        xml.WriteAttributeString("tests", tally.Results.Count.ToString(CultureInfo.InvariantCulture));
        xml.WriteAttributeString("failures", tally.Failing.ToString(CultureInfo.InvariantCulture));
        xml.WriteAttributeString("errors", tally.NotMeasured.ToString(CultureInfo.InvariantCulture));
        xml.WriteAttributeString("time", Seconds(tally.Elapsed));
    }

    private static void TestCase(XmlWriter xml, CheckTally tally, PairCheckResult result)
    {
        xml.WriteStartElement("testcase");
        xml.WriteAttributeString("name", Clean(result.Pair.Name));
        xml.WriteAttributeString("classname", Clean(ClassName(result)));
        xml.WriteAttributeString("time", Seconds(result.Elapsed));
        var output = new StringBuilder();
        if (CheckTally.IsNotMeasured(result))
        {
            xml.WriteStartElement("error");
            xml.WriteAttributeString("message", Clean($"{RunStatusText.Word(result.Status)}: {result.Error ?? "no reason recorded"}"));
            xml.WriteAttributeString("type", RunStatusText.Word(result.Status));
            xml.WriteString(Clean($"The check of {result.Pair.Name} ({result.Pair.X} vs {result.Pair.Y}) {Outcome(result)}: the pair's state is unknown."));
            xml.WriteEndElement();
        }
        else if (tally.Failures(result) is { Count: > 0 } failures)
        {
            var worst = failures[0];
            var more = failures.Count > 1 ? $" (and {failures.Count - 1} more)" : string.Empty;
            xml.WriteStartElement("failure");
            xml.WriteAttributeString("message", Clean($"{CheckTally.Headline(worst)}{more}: {worst.Message}"));
            xml.WriteAttributeString("type", JsonContract.Name(worst.Kind));
            var body = new StringBuilder();
            body.Append(result.Pair.X).Append(" vs ").Append(result.Pair.Y).Append(": ").Append(CheckTally.KeyFigures(result)).Append('\n');
            foreach (var finding in failures)
            {
                body.Append('\n').Append(CheckTally.Headline(finding)).Append('\n').Append("  ").Append(finding.Message).Append('\n');
            }

            body.Append('\n').Append(Cautions.SignalsNotProof);
            xml.WriteString(Clean(body.ToString()));
            xml.WriteEndElement();
        }

        if (result.Profile is not null && !CheckTally.IsNotMeasured(result))
        {
            output.Append(CheckTally.KeyFigures(result)).Append('\n');
        }

        foreach (var finding in tally.Others(result))
        {
            output.Append(CheckTally.Headline(finding)).Append(": ").Append(finding.Message).Append('\n');
        }

        if (output.Length > 0)
        {
            xml.WriteElementString("system-out", Clean(output.ToString()));
        }

        xml.WriteEndElement();
    }

    private static string Outcome(PairCheckResult result) => result.Status switch
    {
        Core.History.RunStatus.Unmeasurable => "measured nothing",
        Core.History.RunStatus.Interrupted => "was cut off",
        _ => "failed to run",
    };

    private static void Property(XmlWriter xml, string name, string value)
    {
        xml.WriteStartElement("property");
        xml.WriteAttributeString("name", name);
        xml.WriteAttributeString("value", value);
        xml.WriteEndElement();
    }

    private static string Seconds(TimeSpan elapsed) =>
        Math.Max(0, elapsed.TotalSeconds).ToString("0.000", CultureInfo.InvariantCulture);

    /// <summary>
    /// XML 1.0 has no escape for most control characters (a database error can carry one): each becomes U+FFFD, so
    /// the report stays well-formed instead of the writer throwing.
    /// </summary>
    internal static string Clean(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        StringBuilder? clean = null;
        for (var i = 0; i < text.Length; i++)
        {
            var c = text[i];
            if (XmlConvert.IsXmlChar(c))
            {
                clean?.Append(c);
                continue;
            }

            if (i + 1 < text.Length && XmlConvert.IsXmlSurrogatePair(text[i + 1], c))
            {
                clean?.Append(c).Append(text[i + 1]);
                i++;
                continue;
            }

            clean ??= new StringBuilder(text, 0, i, text.Length);
            clean.Append('\uFFFD');
        }

        return clean?.ToString() ?? text;
    }
}
