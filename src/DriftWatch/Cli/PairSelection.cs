using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Cli;

internal static class PairSelection
{
    /// <summary>All pairs, or the one named; an unknown name is a usage error with the closest name as a hint.</summary>
    public static IReadOnlyList<PairConfig> Select(DriftWatchConfig config, string? name) => Select(config, name, []);

    /// <summary>
    /// All pairs when neither a name nor a tag is given; otherwise the pair named plus every pair carrying any of the
    /// tags (a union, in the configuration's order, each pair once). An unknown name or a tag no pair carries is a
    /// usage error with a hint, so a mistyped tag never turns into a green step that checked nothing.
    /// </summary>
    public static IReadOnlyList<PairConfig> Select(DriftWatchConfig config, string? name, IReadOnlyList<string> tags)
    {
        ArgumentNullException.ThrowIfNull(config);
        ArgumentNullException.ThrowIfNull(tags);
        if (name is null && tags.Count == 0)
        {
            return config.Pairs;
        }

        var named = name is null ? null : Find(config, name);
        foreach (var tag in tags)
        {
            CheckTag(config, tag);
        }

        return [.. config.Pairs.Where(p => (named is not null && string.Equals(p.Name, named.Name, StringComparison.Ordinal)) || p.Tags.Intersect(tags, StringComparer.Ordinal).Any())];
    }

    public static PairConfig Find(DriftWatchConfig config, string name)
    {
        ArgumentNullException.ThrowIfNull(config);
        var pair = config.FindPair(name);
        if (pair is not null)
        {
            return pair;
        }

        var where = config.FilePath ?? "the configuration";
        throw new CliUsageException($"no pair named '{name}' in {where}{KeyHints.DidYouMean(name, config.Pairs.Select(p => p.Name))}");
    }

    /// <summary>Tags match as written (case counts), as a mailing list's tag filter matches them.</summary>
    private static void CheckTag(DriftWatchConfig config, string tag)
    {
        var known = config.Pairs.SelectMany(p => p.Tags).Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal).ToArray();
        if (known.Contains(tag, StringComparer.Ordinal))
        {
            return;
        }

        var where = config.FilePath ?? "the configuration";
        var list = known.Length == 0 ? "no pair there has tags" : "known tags: " + string.Join(", ", known);
        throw new CliUsageException($"no pair carries the tag '{tag}' in {where}{KeyHints.DidYouMean(tag, known)}; {list}");
    }
}
