namespace DriftWatch.Core.History;

/// <summary>
/// Exact figures the source database computed over the whole window (push-down aggregates), so a very
/// large table gets exact counts and linear figures without moving its rows; the sample supplies the shape.
/// Null members: the database returned NULL (e.g. zero variance).
/// </summary>
public sealed record SourceFigures(
    long RowCount,
    long UsedCount,
    long NullCount,
    double? PearsonR,
    double? Slope,
    double? Intercept,
    double? XMean,
    double? YMean,
    double? XVariance,
    double? YVariance);
