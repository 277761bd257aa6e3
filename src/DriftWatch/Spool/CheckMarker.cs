namespace DriftWatch.Spool;

/// <summary>Left on disk while a check runs: at the next start a marker still there means the check was cut off.</summary>
internal sealed record CheckMarker(string RunKey, string Pair, DateTimeOffset StartedAt);
