namespace DriftWatch.Spool;

/// <summary>What <c>/healthz</c> and <c>/metrics</c> show of the spool (snake_case in JSON).</summary>
/// <param name="Runs">Runs waiting for the store.</param>
/// <param name="Full">True when the last run offered did not fit (max_runs or max_bytes reached).</param>
/// <param name="DroppedRuns">Runs not kept because the spool was full, since this process started.</param>
/// <param name="UnreadableFiles">Spool files that could not be read and were moved to <c>unreadable/</c>, since this process started.</param>
internal sealed record SpoolStatus(string Path, int Runs, long Bytes, int MaxRuns, long MaxBytes, bool Full, long DroppedRuns, long UnreadableFiles);
