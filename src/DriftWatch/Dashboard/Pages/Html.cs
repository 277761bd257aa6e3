using System.Text;
using System.Text.Encodings.Web;
using System.Text.Unicode;

namespace DriftWatch.Dashboard.Pages;

/// <summary>
/// A small HTML writer that escapes every text and attribute value it is given; markup that is not escaped
/// has to be passed through <see cref="Raw"/> on purpose (our own constants, SVG from <see cref="InlineSvg"/>).
/// Razor would do the escaping too, but needs the Razor SDK on the project; the pages are plain enough
/// that one writer keeps all escaping in one place.
/// </summary>
internal sealed class Html
{
    // Every script-relevant character (< > & " ') is still escaped; letters such as ρ and τ stay readable.
    private static readonly HtmlEncoder Encoder = HtmlEncoder.Create(UnicodeRanges.All);

    private readonly StringBuilder _text = new();

    public static string Encode(string? value) => value is null ? string.Empty : Encoder.Encode(value);

    /// <summary>Opens an element. <paramref name="tag"/> and attribute names are our own constants; values are escaped.</summary>
    public Html Open(string tag, params (string Name, string? Value)[] attributes)
    {
        _text.Append('<').Append(tag);
        foreach (var (name, value) in attributes)
        {
            if (value is null)
            {
                continue;
            }

            _text.Append(' ').Append(name);
            if (value.Length > 0)
            {
                _text.Append("=\"").Append(Encode(value)).Append('"');
            }
        }

        _text.Append('>');
        return this;
    }

    public Html Close(string tag)
    {
        _text.Append("</").Append(tag).Append('>');
        return this;
    }

    /// <summary>An element holding only text.</summary>
    public Html Element(string tag, string? text, params (string Name, string? Value)[] attributes) =>
        Open(tag, attributes).Text(text).Close(tag);

    public Html Text(string? text)
    {
        _text.Append(Encode(text));
        return this;
    }

    /// <summary>
    /// A name such as "orders.total_vs_items", escaped, with a &lt;wbr&gt; after each '.', '_', '-' and '/': a narrow
    /// column then wraps it between its parts, never inside a word (browsers do not break at those marks on their own).
    /// </summary>
    public Html Name(string? text)
    {
        if (string.IsNullOrEmpty(text))
        {
            return this;
        }

        var start = 0;
        for (var i = 0; i < text.Length - 1; i++)
        {
            if (text[i] is '.' or '_' or '-' or '/')
            {
                _text.Append(Encode(text[start..(i + 1)])).Append("<wbr>");
                start = i + 1;
            }
        }

        _text.Append(Encode(text[start..]));
        return this;
    }

    /// <summary>Markup written as is: only our own constants and sanitised SVG.</summary>
    public Html Raw(string markup)
    {
        _text.Append(markup);
        return this;
    }

    public Html Link(string href, string text, params (string Name, string? Value)[] attributes) =>
        Open("a", [("href", href), .. attributes]).Text(text).Close("a");

    public override string ToString() => _text.ToString();
}
