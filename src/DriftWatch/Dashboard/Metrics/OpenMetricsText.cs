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
    /// The canonical rendering the spec asks for "le" values ("Canonical Numbers": Go's %g of the shortest
    /// round-trip digits, exponent form below 1e-4 and from 1e6 on, ".0" appended when there is neither a point
    /// nor an exponent): 0.05, 1.0, 2.5, 100000.0, 1e+06, 1e-05, +Inf. .NET has no %g of that kind, hence this.
    /// </summary>
    public static string Bound(double value)
    {
        if (double.IsNaN(value))
        {
            return "NaN";
        }

        if (double.IsInfinity(value))
        {
            return value > 0 ? "+Inf" : "-Inf";
        }

        if (value == 0)
        {
            return "0.0";
        }

        // Shortest round-trip digits and the decimal exponent x of d.ddd × 10^x.
        var text = Math.Abs(value).ToString("R", CultureInfo.InvariantCulture);
        var e = text.IndexOf('E', StringComparison.Ordinal);
        var mantissa = e < 0 ? text : text[..e];
        var shift = e < 0 ? 0 : int.Parse(text[(e + 1)..], NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture);
        var point = mantissa.IndexOf('.', StringComparison.Ordinal);
        var integerDigits = point < 0 ? mantissa.Length : point;
        var digits = mantissa.Replace(".", string.Empty, StringComparison.Ordinal);
        var leading = digits.Length - digits.TrimStart('0').Length;
        digits = digits.Trim('0');
        var exponent = integerDigits - leading - 1 + shift;
        var sign = value < 0 ? "-" : string.Empty;

        string body;
        if (exponent < -4 || exponent >= 6)
        {
            var head = digits.Length > 1 ? digits[0] + "." + digits[1..] : digits;
            body = head + "e" + (exponent < 0 ? "-" : "+") + Math.Abs(exponent).ToString("00", CultureInfo.InvariantCulture);
        }
        else if (exponent >= 0)
        {
            var whole = digits.PadRight(exponent + 1, '0');
            body = whole[..(exponent + 1)] + "." + (whole.Length > exponent + 1 ? whole[(exponent + 1)..] : "0");
        }
        else
        {
            body = "0." + new string('0', -exponent - 1) + digits;
        }

        return sign + body;
    }

    private static string EscapeLabel(string value) =>
        value.Replace("\\", "\\\\", StringComparison.Ordinal).Replace("\"", "\\\"", StringComparison.Ordinal).Replace("\n", "\\n", StringComparison.Ordinal);

    // HELP is an escaped-string too; a double quote needs no escape there but escaping it is allowed.
    private static string EscapeHelp(string value) => EscapeLabel(value);
}
