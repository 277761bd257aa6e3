using System.Text.Json.Serialization;
using DriftWatch.Core.History;

namespace DriftWatch.Output;

/// <summary>
/// The exact figures the source computed over the whole window: <c>rows</c> is the window's row count, not the
/// sample's (the profile's <c>n_rows</c> counts the sampled rows).
/// </summary>
internal sealed record WindowJson(
    [property: JsonPropertyName("rows")] long Rows,
    [property: JsonPropertyName("usable_rows")] long UsableRows,
    [property: JsonPropertyName("null_rows")] long NullRows,
    [property: JsonPropertyName("pearson_r")] double? PearsonR,
    [property: JsonPropertyName("slope")] double? Slope,
    [property: JsonPropertyName("intercept")] double? Intercept)
{
    public static WindowJson? Of(SourceFigures? figures) => figures is null
        ? null
        : new WindowJson(figures.RowCount, figures.UsedCount, figures.NullCount, JsonContract.Finite(figures.PearsonR), JsonContract.Finite(figures.Slope), JsonContract.Finite(figures.Intercept));
}

/// <summary>The baseline a run was judged against, as recorded with the run (means over the baseline's runs).</summary>
internal sealed record JudgedAgainstJson(
    [property: JsonPropertyName("created_at")] DateTimeOffset CreatedAt,
    [property: JsonPropertyName("covers_from")] DateTimeOffset CoversFrom,
    [property: JsonPropertyName("covers_to")] DateTimeOffset CoversTo,
    [property: JsonPropertyName("run_count")] int RunCount,
    [property: JsonPropertyName("accepted")] bool Accepted,
    [property: JsonPropertyName("pearson_r")] double? PearsonR,
    [property: JsonPropertyName("slope")] double? Slope,
    [property: JsonPropertyName("intercept")] double? Intercept,
    [property: JsonPropertyName("residual_sd")] double? ResidualSd,
    [property: JsonPropertyName("rows")] double? Rows,
    [property: JsonPropertyName("outlier_rate")] double? OutlierRate)
{
    public static JudgedAgainstJson? Of(BaselineSummary? b) => b is null
        ? null
        : new JudgedAgainstJson(
            b.CreatedAt, b.CoversFrom, b.CoversTo, b.RunCount, b.Accepted,
            JsonContract.Finite(b.PearsonR), JsonContract.Finite(b.Slope), JsonContract.Finite(b.Intercept),
            JsonContract.Finite(b.ResidualSd), JsonContract.Finite(b.Rows), JsonContract.Finite(b.OutlierRate));
}
