using System.Collections.Concurrent;
using DriftWatch.Core.Configuration;
using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>
/// Grouping at execution time, one Quartz job per pair kept (live reload adds, removes and reschedules pairs
/// one by one): when a pair's job runs for its scheduled slot T, it claims (<see cref="ISlotClaims"/>) its own
/// slot and that of every pair of its table group (<see cref="TableGroups"/>) whose schedule also fires at T,
/// and checks them with one shared read; those pairs' own jobs for T then find their claim taken and return.
/// </summary>
internal sealed class SlotGroups(LiveConfig config, TableGroups groups, ISlotClaims claims, ILogger<SlotGroups> logger)
{
    /// <summary>One gate per pair name: held while this worker checks the pair.</summary>
    private readonly ConcurrentDictionary<string, SemaphoreSlim> checking = new(StringComparer.Ordinal);

    /// <summary>
    /// The pairs this job checks for <paramref name="slot"/>: empty when <paramref name="pair"/>'s slot was already
    /// claimed (checked with its group), else the pair and the pairs of its group it claimed. Without a slot (a job
    /// started by hand) or when the store cannot take claims, the pair alone.
    /// </summary>
    /// <param name="recovering">
    /// The job runs again because its worker died mid-check. That worker may have claimed the pair's whole group
    /// before it died, and the other pairs' jobs then returned: the recovered job takes over every claim of the
    /// group its dead worker held, so none of those pairs misses the slot. A claim held by a live worker stays its.
    /// </param>
    public async Task<IReadOnlyList<PairConfig>> ClaimAsync(PairConfig pair, DateTimeOffset? slot, bool recovering, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        if (slot is not { } at)
        {
            return [pair];
        }

        try
        {
            if (await claims.TryClaimAsync(pair.Name, at, cancellationToken))
            {
                return await GroupAsync(pair, at, claims.TryClaimAsync, cancellationToken);
            }

            if (recovering && await claims.TryTakeOverAsync(pair.Name, at, cancellationToken))
            {
                var group = await GroupAsync(pair, at, claims.TryTakeOverAsync, cancellationToken);
                logger.LogInformation(
                    "Slot {Slot:o} of {Pair}: taken over from a worker that died, with {Count} pairs of its table group", at, pair.Name, group.Count - 1);
                return group;
            }

            logger.LogDebug("Slot {Slot:o} of {Pair} was checked with its table group", at, pair.Name);
            return [];
        }
        catch (Exception ex) when (ex is System.Data.Common.DbException or IOException or TimeoutException or System.Net.Sockets.SocketException)
        {
            // The store is out (runs go to the spool meanwhile): check the pair itself rather than skip its slot.
            logger.LogWarning("Slot {Slot:o} of {Pair}: the store could not take the claim ({Error}); checking the pair alone", at, pair.Name, ex.Message);
            return [pair];
        }
    }

    /// <summary>The pair and each pair of its table group that also fires at <paramref name="at"/> and that <paramref name="take"/> gets.</summary>
    private async Task<IReadOnlyList<PairConfig>> GroupAsync(
        PairConfig pair, DateTimeOffset at, Func<string, DateTimeOffset, CancellationToken, Task<bool>> take, CancellationToken cancellationToken)
    {
        var group = new List<PairConfig> { pair };
        if (groups.KeyOf(pair) is not { } key)
        {
            return group;
        }

        foreach (var other in config.Current.Pairs)
        {
            if (other.Name != pair.Name && key.Equals(groups.KeyOf(other)) && FiresAt(other, at) && TableGroups.Fits(group, other)
                && await take(other.Name, at, cancellationToken))
            {
                group.Add(other);
            }
        }

        return group;
    }

    /// <summary>
    /// Checks what <see cref="ClaimAsync"/> returned: one shared read for a group, else the pair's own check. A pair
    /// still being checked by another job (its group's, for an earlier slot) is waited for first: Quartz keeps one
    /// job from overlapping itself, but not a pair checked by another pair's job, and two checks of one pair at once
    /// would both be recorded. The gates are taken in name order, so two groups waiting on each other cannot lock.
    /// </summary>
    public async Task<IReadOnlyList<PairCheckResult>> CheckAsync(IReadOnlyList<PairConfig> pairs, DateTimeOffset? slot, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pairs);
        var held = new List<SemaphoreSlim>(pairs.Count);
        try
        {
            foreach (var name in pairs.Select(p => p.Name).Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal))
            {
                var gate = checking.GetOrAdd(name, _ => new SemaphoreSlim(1, 1));
                await gate.WaitAsync(cancellationToken);
                held.Add(gate);
            }

            return await groups.CheckAsync(pairs, slot, cancellationToken);
        }
        finally
        {
            foreach (var gate in held)
            {
                gate.Release();
            }
        }
    }

    private static bool FiresAt(PairConfig pair, DateTimeOffset at)
    {
        try
        {
            return new CronExpression(pair.Schedule, TimeZoneInfo.Utc).IsSatisfiedBy(at);
        }
        catch (FormatException)
        {
            return false;
        }
    }
}
