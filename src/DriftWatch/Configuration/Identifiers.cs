using System.Text.RegularExpressions;

namespace DriftWatch.Configuration;

/// <summary>
/// What the file may name in SQL and what it may call its own things. Tables and columns end up in
/// generated SQL, so only plain identifiers pass: letters, digits, '_' and '$', not starting with a digit
/// or '$' (common practice for unquoted SQL identifiers; PostgreSQL's limit of 63 bytes, from memory).
/// Anything else (quotes, spaces, semicolons) is refused rather than escaped.
/// </summary>
internal static partial class Identifiers
{
    public const int MaxPartLength = 63;

    public static string? CheckTable(string text) =>
        TableName().IsMatch(text) && text.Split('.').All(p => p.Length <= MaxPartLength)
            ? null
            : $"'{text}' is not a plain table name; use name or schema.name made of letters, digits, '_' and '$', starting with a letter or '_'";

    public static string? CheckColumn(string text) =>
        ColumnName().IsMatch(text) && text.Length <= MaxPartLength
            ? null
            : $"'{text}' is not a plain column name; use letters, digits, '_' and '$', starting with a letter or '_' (at most {MaxPartLength})";

    /// <summary>Names of sources, pairs and mailing lists: they appear in URLs, file names and logs.</summary>
    public static string? CheckName(string text) =>
        OwnName().IsMatch(text)
            ? null
            : $"'{text}' is not a usable name; use letters, digits, '.', '_' or '-', starting with a letter or digit (at most 100)";

    [GeneratedRegex(@"^[A-Za-z_][A-Za-z0-9_$]*(\.[A-Za-z_][A-Za-z0-9_$]*)?$", RegexOptions.CultureInvariant)]
    private static partial Regex TableName();

    [GeneratedRegex(@"^[A-Za-z_][A-Za-z0-9_$]*$", RegexOptions.CultureInvariant)]
    private static partial Regex ColumnName();

    [GeneratedRegex(@"^[A-Za-z0-9][A-Za-z0-9_.\-]{0,99}$", RegexOptions.CultureInvariant)]
    private static partial Regex OwnName();
}
