namespace DriftWatch.Sources.MySql;

/// <summary>
/// MySQL runs every statement of a command text (MySqlConnector always allows several), and a DDL statement
/// commits the read-only transaction implicitly. So a configured <c>where</c> or <c>query</c> must be one piece
/// of one SELECT: this scanner refuses a <c>;</c> outside quotes and comments, an executable comment
/// (<c>/*! … */</c>, <c>/*M! … */</c>, whose text the server runs) and an unterminated quote or comment. It lexes
/// as the session's sql_mode says: with NO_BACKSLASH_ESCAPES a backslash does not escape a quote.
/// Hand-written: no library exposes MySQL's lexer to .NET.
/// </summary>
internal static class MySqlConfiguredSql
{
    /// <summary>Null when the text is one piece of a statement, else why not.</summary>
    public static string? Problem(string text, bool backslashEscapes)
    {
        ArgumentNullException.ThrowIfNull(text);
        var i = 0;
        while (i < text.Length)
        {
            var c = text[i];
            if (c is '\'' or '"' or '`')
            {
                i = SkipQuoted(text, i, backslashEscapes && c != '`');
                if (i < 0)
                {
                    return "it has an unterminated quote";
                }

                continue;
            }

            if (c == '#' || (c == '-' && At(text, i, "--") && (i + 2 >= text.Length || char.IsWhiteSpace(text[i + 2]))))
            {
                var end = text.IndexOf('\n', i);
                if (end < 0)
                {
                    return "it ends in a line comment, which would hide the rest of DriftWatch's statement";
                }

                i = end + 1;
                continue;
            }

            if (c == '/' && At(text, i, "/*"))
            {
                if (At(text, i, "/*!") || At(text, i, "/*M!"))
                {
                    return "it holds an executable comment (/*! … */)";
                }

                var end = text.IndexOf("*/", i + 2, StringComparison.Ordinal);
                if (end < 0)
                {
                    return "it has an unterminated comment";
                }

                i = end + 2;
                continue;
            }

            if (c == ';')
            {
                return "it holds a ';': a filter or query must be a single SELECT";
            }

            i++;
        }

        return null;
    }

    private static bool At(string text, int i, string token) => string.CompareOrdinal(text, i, token, 0, token.Length) == 0;

    /// <summary>The index after the closing quote, or −1.</summary>
    private static int SkipQuoted(string text, int start, bool backslashEscapes)
    {
        var quote = text[start];
        var i = start + 1;
        while (i < text.Length)
        {
            var c = text[i];
            if (backslashEscapes && c == '\\')
            {
                i += 2;
                continue;
            }

            if (c == quote)
            {
                if (i + 1 < text.Length && text[i + 1] == quote)
                {
                    i += 2;
                    continue;
                }

                return i + 1;
            }

            i++;
        }

        return -1;
    }
}
