using System.Globalization;
using System.Text;

namespace DriftWatch.Core.Discovery;

/// <summary>
/// Names for proposed pairs, "orders.total_vs_net", valid under the configuration's rule for names (letters, digits,
/// '.', '_' or '-', starting with a letter or digit, at most 100) and unique among the names already taken.
/// </summary>
public static class PairNames
{
    public const int MaxLength = 100;

    /// <param name="taken">Names already in use (the configuration's pairs, earlier proposals); the new name is added to it.</param>
    public static string For(string table, string x, string y, ISet<string> taken)
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(taken);
        var stem = Clean(table) + "." + Clean(y) + "_vs_" + Clean(x);
        if (!char.IsAsciiLetterOrDigit(stem[0]))
        {
            stem = "p" + stem;
        }

        for (var n = 1; ; n++)
        {
            var suffix = n == 1 ? string.Empty : "-" + n.ToString(CultureInfo.InvariantCulture);
            var name = (stem.Length + suffix.Length > MaxLength ? stem[..(MaxLength - suffix.Length)] : stem) + suffix;
            if (taken.Add(name))
            {
                return name;
            }
        }
    }

    /// <summary>Keeps letters, digits, '.', '_' and '-'; anything else becomes '_'.</summary>
    private static string Clean(string part)
    {
        var text = new StringBuilder(part.Length);
        foreach (var c in part)
        {
            text.Append(char.IsAsciiLetterOrDigit(c) || c is '.' or '_' or '-' ? c : '_');
        }

        return text.Length == 0 ? "_" : text.ToString();
    }
}
