using System.Data.Common;

namespace DriftWatch.Store;

/// <summary>Opens connections to DriftWatch's own store (never to a watched source).</summary>
internal interface IStoreDatabase
{
    StoreDialect Dialect { get; }

    /// <summary>An open connection; the caller disposes it.</summary>
    Task<DbConnection> OpenAsync(CancellationToken cancellationToken);
}
