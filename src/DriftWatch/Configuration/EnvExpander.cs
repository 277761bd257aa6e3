using System.Text;

namespace DriftWatch.Configuration;

/// <summary>
/// Expands <c>${NAME}</c> and <c>${NAME:-default}</c> in a value; <c>$${</c> writes a literal <c>${</c>.
/// Hand-written because .NET's Environment.ExpandEnvironmentVariables knows only <c>%NAME%</c> and no
/// default, and its lookup cannot be swapped for a test's dictionary.
/// </summary>
internal static class EnvExpander
{
    /// <summary>The expanded text, or null with <paramref name="problem"/> set; the problem may name a variable, never a variable's value.</summary>
    /// <param name="unset">
    /// When given, a variable that is unset and has no default is not a problem: the function is told its name
    /// and its result is written instead (offline validation checks the file without the secrets it names).
    /// </param>
    public static string? Expand(string text, Func<string, string?> env, bool secret, out string? problem, Func<string, string>? unset = null)
    {
        problem = null;
        if (!text.Contains('$', StringComparison.Ordinal))
        {
            return text;
        }

        var result = new StringBuilder(text.Length);
        var i = 0;
        while (i < text.Length)
        {
            if (string.CompareOrdinal(text, i, "$${", 0, 3) == 0)
            {
                result.Append("${");
                i += 3;
                continue;
            }

            if (string.CompareOrdinal(text, i, "${", 0, 2) != 0)
            {
                result.Append(text[i]);
                i++;
                continue;
            }

            var close = text.IndexOf('}', i + 2);
            if (close < 0)
            {
                problem = "a '${' has no closing '}' (write $${ for a literal ${)";
                return null;
            }

            var inner = text[(i + 2)..close];
            var separator = inner.IndexOf(":-", StringComparison.Ordinal);
            var name = separator < 0 ? inner : inner[..separator];
            var fallback = separator < 0 ? null : inner[(separator + 2)..];
            if (!IsName(name))
            {
                // A secret's text is never quoted back, not even the part that looked like a reference.
                problem = secret
                    ? "holds a '${' that is not a valid environment variable reference (write $${ for a literal ${)"
                    : $"'${{{name}}}' is not a valid environment variable reference (a name of letters, digits and '_', not starting with a digit; write $${{ for a literal ${{)";
                return null;
            }

            var value = env(name);
            if (string.IsNullOrEmpty(value) && fallback is not null)
            {
                // Shell semantics of ":-": an empty variable also takes the default.
                value = fallback;
            }

            if (value is null && unset is not null)
            {
                value = unset(name);
            }

            if (value is null)
            {
                problem = $"environment variable {name} is not set and has no default (write ${{{name}:-default}} to give one)";
                return null;
            }

            result.Append(value);
            i = close + 1;
        }

        return result.ToString();
    }

    private static bool IsName(string name) =>
        name.Length > 0
        && (char.IsAsciiLetter(name[0]) || name[0] == '_')
        && name.All(c => char.IsAsciiLetterOrDigit(c) || c == '_');
}
