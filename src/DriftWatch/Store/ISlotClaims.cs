namespace DriftWatch.Store;

/// <summary>
/// Claims on pairs' schedule slots: who checks pair P for its slot at time T. A claim is taken at most once, so
/// a pair checked with its table group is not checked again by its own job, on this worker or another one on
/// the same store (<see cref="SlotClaimStore"/>, insert-if-absent in the store).
/// </summary>
internal interface ISlotClaims
{
    /// <summary>True when this call took the claim on (<paramref name="pair"/>, <paramref name="slot"/>); false when it was taken before.</summary>
    Task<bool> TryClaimAsync(string pair, DateTimeOffset slot, CancellationToken cancellationToken);

    /// <summary>
    /// True when the claim on (<paramref name="pair"/>, <paramref name="slot"/>) belonged to a worker that has left
    /// the shared schedule (taken for dead, its jobs recovered) and now belongs to this one; false when its holder is
    /// still a member, is this worker, or nobody claimed it.
    /// </summary>
    Task<bool> TryTakeOverAsync(string pair, DateTimeOffset slot, CancellationToken cancellationToken);
}
