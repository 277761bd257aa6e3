using Dapper;

namespace DriftWatch.Store;

/// <summary>Which schedule slots of a pair the store already holds a run for (runs.slot_at_ms, migration 010).</summary>
internal sealed class RunSlots(IStoreDatabase database)
{
    /// <summary>True when a run of <paramref name="pair"/> for <paramref name="slot"/> is recorded (interrupted runs do not count).</summary>
    public async Task<bool> IsRecordedAsync(string pair, DateTimeOffset slot, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var count = await connection.ExecuteScalarAsync<long>(new CommandDefinition(
            "SELECT count(*) FROM runs WHERE pair = @pair AND slot_at_ms = @slot AND status <> 'interrupted'",
            new { pair, slot = slot.ToUnixTimeMilliseconds() },
            cancellationToken: cancellationToken));
        return count > 0;
    }
}
