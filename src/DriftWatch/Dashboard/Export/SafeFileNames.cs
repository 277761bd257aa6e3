using System.Security.Cryptography;
using System.Text;

namespace DriftWatch.Dashboard.Export;

/// <summary>
/// File names for pair pages of a static export: letters, digits, '.', '_' and '-' kept (no two dots in a row), anything else '_',
/// lower case, at most 80 characters. When that changed the name or two names would meet (also on a
/// case-insensitive disk), a short hash of the real name is appended, so every pair keeps its own file.
/// </summary>
internal static class SafeFileNames
{
    public const int MaxStemLength = 80;

    public static IReadOnlyDictionary<string, string> For(IEnumerable<string> names)
    {
        ArgumentNullException.ThrowIfNull(names);
        var list = names.Distinct(StringComparer.Ordinal).ToArray();
        var stems = list.ToDictionary(n => n, Stem, StringComparer.Ordinal);
        var clashes = stems.GroupBy(kv => kv.Value, StringComparer.Ordinal).Where(g => g.Count() > 1).SelectMany(g => g.Select(kv => kv.Key)).ToHashSet(StringComparer.Ordinal);
        return list.ToDictionary(
            n => n,
            n => (stems[n] == n && !clashes.Contains(n) ? stems[n] : stems[n] + "-" + Hash(n)) + ".html",
            StringComparer.Ordinal);
    }

    private static string Stem(string name)
    {
        var text = new StringBuilder(Math.Min(name.Length, MaxStemLength));
        foreach (var c in name)
        {
            if (text.Length == MaxStemLength)
            {
                break;
            }

            // No "..": harmless without a separator, but a name should not even look like a path step.
            var keep = char.IsAsciiLetterOrDigit(c) || c is '_' or '-' || (c == '.' && (text.Length == 0 || text[^1] != '.'));
            text.Append(keep ? char.ToLowerInvariant(c) : '_');
        }

        var stem = text.ToString().Trim('.');
        return stem.Length == 0 ? "pair" : stem;
    }

    private static string Hash(string name) => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(name)))[..8];
}
