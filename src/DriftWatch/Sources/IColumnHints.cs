namespace DriftWatch.Sources;

/// <summary>
/// What a shared read learned about a column of a table (<see cref="ColumnHint"/>), kept outside the source adapter
/// so a restarted worker, a one-shot check and the other workers of a shared schedule start from it instead of
/// from nothing. A hint only saves work: a missing, stale or wrong one costs a second scan or the full statement,
/// never a wrong figure, since every read checks both what a hint claims.
/// </summary>
internal interface IColumnHints
{
    /// <summary>The hints known for <paramref name="keys"/> of <paramref name="source"/>; keys without one are absent.</summary>
    Task<IReadOnlyDictionary<string, ColumnHint>> ReadAsync(string source, IReadOnlyCollection<string> keys, CancellationToken cancellationToken);

    /// <summary>Keeps <paramref name="hints"/> (key → hint) of <paramref name="source"/>, replacing earlier ones.</summary>
    Task WriteAsync(string source, IReadOnlyDictionary<string, ColumnHint> hints, DateTimeOffset readAt, CancellationToken cancellationToken);
}

/// <param name="Mean">The column's mean over its finite values at the read; null when it had none.</param>
/// <param name="AllFinite">True when the column was a finite number on every row read.</param>
internal sealed record ColumnHint(double? Mean, bool AllFinite);
