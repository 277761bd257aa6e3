using System.Text;

namespace DriftWatch.Core.Baselines;

/// <summary>
/// A seed derived from a name that is the same in every process and on every machine
/// (<see cref="string.GetHashCode()"/> is randomised per process, so it cannot serve).
/// </summary>
public static class StableSeed
{
    // FNV-1a, 32 bit (offset basis 2166136261, prime 16777619; common practice for short keys).
    // Hand-written because the framework offers no stable string hash; four lines do not merit a package.
    public static int FromName(string name)
    {
        ArgumentNullException.ThrowIfNull(name);
        var hash = 2166136261u;
        foreach (var b in Encoding.UTF8.GetBytes(name))
        {
            hash = unchecked((hash ^ b) * 16777619u);
        }

        return unchecked((int)hash);
    }
}
