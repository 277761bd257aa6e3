using System.Text.Json.Serialization;

namespace DriftWatch.Output;

/// <summary>The document <c>driftwatch profile --format json</c> prints.</summary>
internal sealed record ProfileReportJson(
    [property: JsonPropertyName("current")] ProfileJson Current,
    [property: JsonPropertyName("baseline")] ProfileJson? Baseline,
    [property: JsonPropertyName("findings")] IReadOnlyList<FindingJson> Findings,
    [property: JsonPropertyName("unmeasurable")] string? Unmeasurable);
