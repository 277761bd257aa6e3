namespace DriftWatch.Configuration;

/// <summary>
/// The SQL a pair's owner writes (<c>where</c>, <c>query</c>) is embedded into the statement a source builds,
/// so it must be one fragment: no statement separator, and for <c>where</c> no comment that would swallow
/// what the source appends after it. This is a guard against accidents, not a SQL parser; sources connect
/// with read-only accounts.
/// </summary>
internal static class SqlFragments
{
    public static string? CheckWhere(string where)
    {
        if (where.Contains(';', StringComparison.Ordinal))
        {
            return "must be one condition without ';'";
        }

        if (where.Contains("--", StringComparison.Ordinal) || where.Contains("/*", StringComparison.Ordinal))
        {
            return "must not hold SQL comments (-- or /*): they would swallow the rest of the statement";
        }

        return string.IsNullOrWhiteSpace(where) ? "is empty; leave it out to read every row" : null;
    }

    /// <summary>The query without surrounding blanks and one trailing ';', or null when it is not a single statement.</summary>
    public static string? TrimQuery(string query, out string? problem)
    {
        problem = null;
        var trimmed = query.Trim();
        if (trimmed.EndsWith(';'))
        {
            trimmed = trimmed[..^1].TrimEnd();
        }

        if (trimmed.Length == 0)
        {
            problem = "is empty";
            return null;
        }

        if (trimmed.Contains(';', StringComparison.Ordinal))
        {
            problem = "must be a single SELECT statement; it holds a ';' before its end";
            return null;
        }

        return trimmed;
    }
}
