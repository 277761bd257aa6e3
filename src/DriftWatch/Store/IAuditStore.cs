using DriftWatch.Core.Triage;

namespace DriftWatch.Store;

/// <summary>The audit log of triage actions (migration 008). One implementation serves SQLite and PostgreSQL.</summary>
internal interface IAuditStore
{
    /// <summary>Appends the entry; returns its id.</summary>
    Task<long> AppendAsync(AuditEntry entry, CancellationToken cancellationToken);

    /// <summary>Newest first; of one pair only when <paramref name="pair"/> is set.</summary>
    Task<IReadOnlyList<AuditEntry>> ListAsync(string? pair, int limit, CancellationToken cancellationToken);
}
