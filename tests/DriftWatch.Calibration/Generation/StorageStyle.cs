namespace DriftWatch.Calibration.Generation;

/// <summary>How a pair's table receives its data, the two common shapes of a loaded table.</summary>
internal enum StorageStyle
{
    /// <summary>The table is emptied and reloaded every day; the pair reads the whole table.</summary>
    Replaced,

    /// <summary>Every day's rows are appended with their load time; the pair reads <c>window: {column: loaded_at, last: 24h}</c>.</summary>
    Appended,
}
