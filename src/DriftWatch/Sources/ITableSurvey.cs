using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;

namespace DriftWatch.Sources;

/// <param name="Table">As the user wrote it: "orders" or "sales.orders" (a part may be double-quoted).</param>
/// <param name="MaxColumns">At most this many numeric columns are surveyed, the first in catalogue order.</param>
/// <param name="SampleRows">Rows of the shared sample (read whole below <see cref="SampleSpec.DefaultAllRowsBelow"/>, as pairs are).</param>
internal sealed record SurveyRequest(string Table, int MaxColumns, int SampleRows);

/// <summary>One table surveyed in one read-only session: its catalogue, the columns read, their figures, the matrix and the shared sample.</summary>
internal sealed record TableSurvey(
    QualifiedName Table,
    IReadOnlyList<CatalogueColumn> Catalogue,
    ColumnSelection Selection,
    IReadOnlyList<ColumnStats> Stats,
    CorrelationMatrix Matrix,
    SharedSample Sample);

/// <summary>
/// Surveys every numeric column of one table for <c>driftwatch discover</c>, in one read-only session with the
/// source's statement timeout, as <see cref="IPairSource"/> reads a pair: the catalogue's numeric columns, their
/// counts and ranges, the exact correlation matrix of their pairwise-complete finite rows computed by the engine
/// (<see cref="SumPlan"/>), and one shared sample of whole rows drawn as the kind samples a pair.
/// Failures are <see cref="SourceException"/>s: <see cref="SourceFailure.MissingTable"/> for an unknown table (with
/// the closest name), <see cref="SourceFailure.NonNumericColumn"/> for a table with fewer than two numeric columns.
/// </summary>
internal interface ITableSurvey
{
    SourceConfig Config { get; }

    /// <param name="progress">Lines for people on long work ("computing the correlation matrix of 30 columns …").</param>
    Task<TableSurvey> SurveyAsync(SurveyRequest request, IProgress<string>? progress, CancellationToken cancellationToken);
}
