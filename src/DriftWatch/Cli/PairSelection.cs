using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Cli;

internal static class PairSelection
{
    /// <summary>All pairs, or the one named; an unknown name is a usage error with the closest name as a hint.</summary>
    public static IReadOnlyList<PairConfig> Select(DriftWatchConfig config, string? name)
    {
        ArgumentNullException.ThrowIfNull(config);
        if (name is null)
        {
            return config.Pairs;
        }

        return [Find(config, name)];
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
}
