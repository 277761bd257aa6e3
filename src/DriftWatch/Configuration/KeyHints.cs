namespace DriftWatch.Configuration;

/// <summary>
/// "Did you mean" for unknown keys. Written here because .NET has no edit-distance routine and the
/// libraries already referenced do not expose one; twenty lines do not justify a new package.
/// </summary>
internal static class KeyHints
{
    /// <summary>
    /// Optimal-string-alignment distance: Levenshtein's insert, delete and substitute, plus the swap of two
    /// neighbouring letters ("smaple" → "sample" costs 1), which is the commonest typing slip.
    /// </summary>
    public static int Distance(string a, string b)
    {
        ArgumentNullException.ThrowIfNull(a);
        ArgumentNullException.ThrowIfNull(b);
        var d = new int[a.Length + 1, b.Length + 1];
        for (var i = 0; i <= a.Length; i++)
        {
            d[i, 0] = i;
        }

        for (var j = 0; j <= b.Length; j++)
        {
            d[0, j] = j;
        }

        for (var i = 1; i <= a.Length; i++)
        {
            for (var j = 1; j <= b.Length; j++)
            {
                var cost = a[i - 1] == b[j - 1] ? 0 : 1;
                var best = Math.Min(Math.Min(d[i - 1, j] + 1, d[i, j - 1] + 1), d[i - 1, j - 1] + cost);
                if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1])
                {
                    best = Math.Min(best, d[i - 2, j - 2] + 1);
                }

                d[i, j] = best;
            }
        }

        return d[a.Length, b.Length];
    }

    /// <summary>
    /// The pair a mistyped name most likely meant: the closest name by <see cref="Closest"/>, else the one name that
    /// ends with the typed text after a separator ("total_vs_items" for "orders.total_vs_items"), case ignored.
    /// </summary>
    public static string? ClosestPair(string unknown, IEnumerable<string> names)
    {
        ArgumentNullException.ThrowIfNull(unknown);
        var list = names.Distinct(StringComparer.Ordinal).ToArray();
        if (Closest(unknown, list) is { } close)
        {
            return close;
        }

        var tails = list.Where(n => n.Length > unknown.Length
            && n.EndsWith(unknown, StringComparison.OrdinalIgnoreCase)
            && n[n.Length - unknown.Length - 1] is '.' or '_' or '-' or '/' or ':').ToArray();
        return unknown.Length > 0 && tails.Length == 1 ? tails[0] : null;
    }

    /// <summary>" (did you mean 'NAME'?)" when there is a likely pair, else empty: appended to an unknown-pair message.</summary>
    public static string DidYouMean(string unknown, IEnumerable<string> names) =>
        ClosestPair(unknown, names) is { } hint ? $" (did you mean '{hint}'?)" : string.Empty;

    /// <summary>The closest allowed key, if it is close enough to be a slip rather than another word.</summary>
    public static string? Closest(string unknown, IEnumerable<string> allowed)
    {
        var lowered = unknown.ToLowerInvariant();
        string? best = null;
        var bestDistance = int.MaxValue;
        foreach (var candidate in allowed)
        {
            var distance = Distance(lowered, candidate.ToLowerInvariant());
            if (distance < bestDistance)
            {
                best = candidate;
                bestDistance = distance;
            }
        }

        // A third of the word, at least one and at most three edits: "smaple" and "Rows" are slips,
        // "colour" for "tags" is not.
        var limit = Math.Clamp(unknown.Length / 3, 1, 3);
        return bestDistance <= limit ? best : null;
    }
}
