using DriftWatch.Core.History;

namespace DriftWatch.Store;

/// <summary>Runs, findings and baselines. One implementation serves SQLite and PostgreSQL (see <see cref="StoreDialect"/>).</summary>
internal interface IHistoryStore
{
    /// <summary>Writes the run, its findings and its points in one transaction; returns the run id.</summary>
    Task<long> RecordRunAsync(NewRun run, CancellationToken cancellationToken);

    /// <summary>Newest first. <paramref name="includePoints"/> loads the sampled points too (costly).</summary>
    Task<IReadOnlyList<RunRecord>> GetRunsAsync(string pair, int limit, bool includePoints, CancellationToken cancellationToken, DateTimeOffset? before = null);

    /// <summary>Successful runs in a time range, oldest first, with points; for pooling a baseline.</summary>
    Task<IReadOnlyList<RunRecord>> GetSuccessfulRunsAsync(string pair, DateTimeOffset? from, DateTimeOffset? to, int? limit, CancellationToken cancellationToken);

    Task<RunRecord?> GetRunAsync(long id, bool includePoints, CancellationToken cancellationToken);

    /// <summary>The latest run of every pair that has one.</summary>
    Task<IReadOnlyList<RunRecord>> GetLatestRunsAsync(CancellationToken cancellationToken);

    Task<int> CountRunsAsync(string pair, CancellationToken cancellationToken);

    Task<StoredBaseline?> GetBaselineAsync(string pair, CancellationToken cancellationToken);

    Task SaveBaselineAsync(StoredBaseline baseline, CancellationToken cancellationToken);

    Task<bool> DeleteBaselineAsync(string pair, CancellationToken cancellationToken);

    /// <summary>Deletes runs started before <paramref name="runsBefore"/> and drops points of runs started before <paramref name="pointsBefore"/>.</summary>
    Task<int> PruneAsync(DateTimeOffset runsBefore, DateTimeOffset pointsBefore, CancellationToken cancellationToken);
}
