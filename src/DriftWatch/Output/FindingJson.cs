using System.Text.Json.Serialization;
using DriftWatch.Core.Findings;

namespace DriftWatch.Output;

/// <summary>One finding in the outward JSON contract; kind and severity are snake_case strings.</summary>
internal sealed record FindingJson(
    [property: JsonPropertyName("kind")] FindingKind Kind,
    [property: JsonPropertyName("severity")] Severity Severity,
    [property: JsonPropertyName("p_value")] double? PValue,
    [property: JsonPropertyName("effect")] double? Effect,
    [property: JsonPropertyName("message")] string Message);
