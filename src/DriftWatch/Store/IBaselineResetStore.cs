namespace DriftWatch.Store;

/// <summary>When each pair's baseline was last reset (migration 008): its next baseline pools only runs from then on.</summary>
internal interface IBaselineResetStore
{
    Task<DateTimeOffset?> GetResetAsync(string pair, CancellationToken cancellationToken);

    /// <summary>Records (or moves) the pair's reset time.</summary>
    Task SetResetAsync(string pair, DateTimeOffset at, CancellationToken cancellationToken);

    /// <summary>Forgets the pair's reset time (an accepted baseline takes its place as the anchor).</summary>
    Task ClearResetAsync(string pair, CancellationToken cancellationToken);
}
