using System.Text;

namespace DriftWatch.Sources;

/// <summary>
/// Table and column names from the configuration become SQL only through here: every identifier is
/// quoted with double quotes (embedded quotes doubled), so a name can never end the identifier and
/// start a statement. Names are taken as written and are therefore case-sensitive in PostgreSQL.
/// </summary>
internal static class SqlIdentifier
{
    /// <summary>PostgreSQL silently truncates longer identifiers (NAMEDATALEN − 1 bytes); we refuse them instead.</summary>
    public const int MaxBytes = 63;

    /// <summary>The quoted form of one identifier, or an <see cref="ArgumentException"/> naming what is wrong with it.</summary>
    public static string Quote(string name)
    {
        Validate(name);
        return "\"" + name.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"";
    }

    /// <summary>
    /// The MySQL/MariaDB form: backticks, embedded backticks doubled. MySQL allows 64 characters, and no
    /// name may end with a space; both are refused here rather than left to the server.
    /// </summary>
    public static string Backtick(string name)
    {
        Validate(name);
        if (name.Length > 64)
        {
            throw new ArgumentException($"Identifier '{name}' is longer than 64 characters.", nameof(name));
        }

        if (name.EndsWith(' '))
        {
            throw new ArgumentException($"Identifier '{name}' ends with a space, which MySQL does not allow.", nameof(name));
        }

        return "`" + name.Replace("`", "``", StringComparison.Ordinal) + "`";
    }

    public static void Validate(string name)
    {
        ArgumentNullException.ThrowIfNull(name);
        if (name.Length == 0 || string.IsNullOrWhiteSpace(name))
        {
            throw new ArgumentException("An identifier must not be empty.", nameof(name));
        }

        if (name.Any(char.IsControl))
        {
            throw new ArgumentException($"Identifier '{Printable(name)}' contains a control character.", nameof(name));
        }

        if (Encoding.UTF8.GetByteCount(name) > MaxBytes)
        {
            throw new ArgumentException($"Identifier '{name}' is longer than {MaxBytes} bytes.", nameof(name));
        }
    }

    /// <summary>
    /// Splits "schema.table" (or "table") into its parts. A part may itself be double-quoted to hold a dot
    /// or a quote (<c>"my.schema"."odd""name"</c>); unquoted parts are taken literally.
    /// </summary>
    public static QualifiedName ParseQualified(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var parts = new List<string>();
        var current = new StringBuilder();
        var i = 0;
        var partStart = true;
        while (i < text.Length)
        {
            var c = text[i];
            if (partStart && c == '"')
            {
                i++;
                while (true)
                {
                    if (i >= text.Length)
                    {
                        throw new ArgumentException($"Name '{text}' has an unterminated quote.", nameof(text));
                    }

                    if (text[i] == '"')
                    {
                        if (i + 1 < text.Length && text[i + 1] == '"')
                        {
                            current.Append('"');
                            i += 2;
                            continue;
                        }

                        i++;
                        break;
                    }

                    current.Append(text[i++]);
                }

                if (i < text.Length && text[i] != '.')
                {
                    throw new ArgumentException($"Name '{text}' has text after a closing quote.", nameof(text));
                }

                partStart = false;
                continue;
            }

            if (c == '.')
            {
                parts.Add(current.ToString());
                current.Clear();
                partStart = true;
                i++;
                continue;
            }

            current.Append(c);
            partStart = false;
            i++;
        }

        parts.Add(current.ToString());
        if (parts.Count > 2)
        {
            throw new ArgumentException($"Name '{text}' has more than two parts; write schema.table (quote a part that contains a dot).", nameof(text));
        }

        foreach (var part in parts)
        {
            Validate(part);
        }

        return parts.Count == 1 ? new QualifiedName(null, parts[0]) : new QualifiedName(parts[0], parts[1]);
    }

    private static string Printable(string name) => new([.. name.Select(c => char.IsControl(c) ? '?' : c)]);
}

/// <summary>A table name with an optional schema; <see cref="Quoted"/> is safe to splice into SQL.</summary>
internal sealed record QualifiedName(string? Schema, string Name)
{
    public string Quoted => Schema is null ? SqlIdentifier.Quote(Name) : SqlIdentifier.Quote(Schema) + "." + SqlIdentifier.Quote(Name);

    /// <summary>The MySQL form, `database`.`table`.</summary>
    public string Backticked => Schema is null ? SqlIdentifier.Backtick(Name) : SqlIdentifier.Backtick(Schema) + "." + SqlIdentifier.Backtick(Name);

    /// <summary>For messages: as the user would write it.</summary>
    public override string ToString() => Schema is null ? Name : Schema + "." + Name;
}
