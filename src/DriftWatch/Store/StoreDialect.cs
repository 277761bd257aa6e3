namespace DriftWatch.Store;

/// <summary>
/// The store speaks one SQL for both engines wherever it can: times are Unix milliseconds (bigint),
/// structured values are JSON text, points are little-endian double blobs. Only DDL differs per dialect.
/// </summary>
internal enum StoreDialect
{
    Sqlite,
    Postgres,
}
