namespace DriftWatch.Calibration.Generation;

/// <summary>
/// Derives independent, repeatable seeds for a pair and for one of its days from the run's seed, so any pair
/// on any day is generated the same way whatever else the run contains (SplitMix64 finaliser, common practice).
/// </summary>
internal static class Seeds
{
    public static int Of(int seed, int a, int b = 0, int c = 0)
    {
        unchecked
        {
            var z = ((ulong)(uint)seed << 32) ^ ((ulong)(uint)a * 0x9E3779B97F4A7C15UL) ^ ((ulong)(uint)b * 0xC2B2AE3D27D4EB4FUL) ^ ((ulong)(uint)c * 0x165667B19E3779F9UL);
            z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
            z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
            z ^= z >> 31;
            return (int)(z & 0x7FFFFFFF);
        }
    }

    public static Random Random(int seed, int a, int b = 0, int c = 0) => new(Of(seed, a, b, c));
}
