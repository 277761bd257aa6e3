using DriftWatch.Calibration.Generation;

namespace DriftWatch.Calibration.Running;

/// <summary>The database the watched pairs live in, loaded by the runner day by day.</summary>
internal interface ISourceDatabase : IAsyncDisposable
{
    /// <summary>For the report header: where the data lives, without secrets.</summary>
    string Describe { get; }

    /// <summary>The <c>sources</c> entry of the configuration (kind and connection lines), indented for YAML.</summary>
    string SourceYaml { get; }

    /// <summary>Environment variables the configuration refers to (a connection string kept out of the file).</summary>
    IReadOnlyDictionary<string, string> Environment { get; }

    Task CreateAsync(IReadOnlyList<CalibrationPair> pairs, CancellationToken cancellationToken);

    /// <summary>One day's load: a replaced table is emptied first; every row gets a load time within the day.</summary>
    Task LoadAsync(CalibrationPair pair, DateOnly date, IReadOnlyList<CalibrationRow> rows, CancellationToken cancellationToken);
}

/// <summary>Spreads a day's rows over 00:00–23:00 UTC, before the day's check at 23:30.</summary>
internal static class LoadTimes
{
    public static DateTimeOffset Of(DateOnly date, int row, int rows) =>
        new DateTimeOffset(date.ToDateTime(TimeOnly.MinValue), TimeSpan.Zero).AddSeconds(Math.Floor(row * (23 * 3600.0 / Math.Max(1, rows))));
}
