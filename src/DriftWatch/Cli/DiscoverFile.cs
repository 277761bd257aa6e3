using System.Text.RegularExpressions;

namespace DriftWatch.Cli;

/// <summary>
/// <c>discover --write FILE</c>: appends the proposed entries to a file of their own, never to the configuration
/// (the user merges them by hand), creating it when missing. Names already in the file are not proposed again.
/// </summary>
internal static partial class DiscoverFile
{
    /// <summary>The usage error for a target that is the configuration file itself (also through a link); null when it may be written.</summary>
    public static string? Refusal(string target, string? configPath)
    {
        ArgumentNullException.ThrowIfNull(target);
        if (Directory.Exists(target))
        {
            return $"--write {target} is a folder; give a file to append the proposed pairs to";
        }

        if (configPath is not null && string.Equals(Resolve(target), Resolve(configPath), StringComparison.Ordinal))
        {
            return $"--write {target} is the configuration file itself; discover never edits it. Give another file and paste its entries under your pairs: key";
        }

        return null;
    }

    /// <summary>The pair names an earlier run already wrote to the file.</summary>
    public static IEnumerable<string> NamesIn(string path) =>
        File.Exists(path) ? File.ReadLines(path).Select(l => NameLine().Match(l)).Where(m => m.Success).Select(m => m.Groups[1].Value) : [];

    /// <summary>Whether the file already holds a <c>pairs:</c> key (so only entries are appended).</summary>
    public static bool HasPairsKey(string path) => File.Exists(path) && File.ReadLines(path).Any(l => l.StartsWith("pairs:", StringComparison.Ordinal));

    public static void Append(string path, string block)
    {
        var existing = File.Exists(path) ? File.ReadAllText(path) : string.Empty;
        var separator = existing.Length == 0 || existing.EndsWith('\n') ? string.Empty : "\n";
        File.AppendAllText(path, separator + block);
    }

    private static string Resolve(string path)
    {
        var full = Path.GetFullPath(path);
        try
        {
            return new FileInfo(full).ResolveLinkTarget(returnFinalTarget: true)?.FullName ?? full;
        }
        catch (IOException)
        {
            return full;
        }
    }

    [GeneratedRegex(@"^\s*-\s*name:\s*""?([A-Za-z0-9][A-Za-z0-9_.\-]*)""?\s*$", RegexOptions.CultureInvariant)]
    private static partial Regex NameLine();
}
