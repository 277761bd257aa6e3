using System.Globalization;
using System.Text;

namespace DriftWatch.Dashboard.Metrics;

/// <summary>
/// Writes the OpenMetrics 1.0 text format (prometheus/docs, docs/specs/om/open_metrics_spec.md): metadata in
/// the order TYPE, UNIT, HELP once per family, families not interleaved, label values escaped (\\, \", \n),
/// "le" values in canonical form, LF line ends and the closing "# EOF". No client library is used: the ones for
/// .NET count in-process events, while these figures are read from the store at scrape time.
/// </summary>
internal sealed class OpenMetricsText
{
    public const string ContentType = "application/openmetrics-text; version=1.0.0; charset=utf-8";

    private readonly StringBuilder _text = new();

    public void Family(string name, string type, string help, string? unit = null)
    {
        _text.Append("# TYPE ").Append(name).Append(' ').Append(type).Append('\n');
        if (unit is not null)
        {
            _text.Append("# UNIT ").Append(name).Append(' ').Append(unit).Append('\n');
        }

        _text.Append("# HELP ").Append(name).Append(' ').Append(EscapeHelp(help)).Append('\n');
    }

    public void Sample(string name, IReadOnlyList<(string Name, string Value)> labels, string value)
    {
        _text.Append(name);
        if (labels.Count > 0)
        {
            _text.Append('{');
            for (var i = 0; i < labels.Count; i++)
            {
                if (i > 0)
                {
                    _text.Append(',');
                }

                _text.Append(labels[i].Name).Append("=\"").Append(EscapeLabel(labels[i].Value)).Append('"');
            }

            _text.Append('}');
        }

        _text.Append(' ').Append(value).Append('\n');
    }

    public string Finish() => _text.Append("# EOF\n").ToString();

    public static string Integer(long value) => value.ToString(CultureInfo.InvariantCulture);

    /// <summary>A float with a decimal point or an exponent, as the spec asks of floating point numbers.</summary>
    public static string Float(double value)
    {
        if (double.IsPositiveInfinity(value))
        {
            return "+Inf";
        }

        var text = value.ToString("R", CultureInfo.InvariantCulture);
        return text.Contains('.', StringComparison.Ordinal) || text.Contains('E', StringComparison.Ordinal) ? text.Replace("E", "e", StringComparison.Ordinal) : text + ".0";
    }

    /// <summary>
    /// The canonical rendering for "le" (the spec's "Canonical Numbers": Go's %g with ".0" appended when there is
    /// no point or exponent): 0.05, 1.0, 2.5, 10.0, +Inf. Exact for the bucket bounds used here, which are
    /// between 1e-4 and 1e6, where %g and the shortest round-trip form agree.
    /// </summary>
    public static string Bound(double value) => Float(value);

    private static string EscapeLabel(string value) =>
        value.Replace("\\", "\\\\", StringComparison.Ordinal).Replace("\"", "\\\"", StringComparison.Ordinal).Replace("\n", "\\n", StringComparison.Ordinal);

    // HELP is an escaped-string too; a double quote needs no escape there but escaping it is allowed.
    private static string EscapeHelp(string value) => EscapeLabel(value);
}
