using System.Text.Json;
using System.Text.Json.Serialization;

namespace DriftWatch.Store;

/// <summary>
/// How the store writes structured values: snake_case names, enums as snake_case strings, the shortest
/// round-trip form of doubles. Named floating literals are accepted so one odd value never loses a run.
/// </summary>
internal static class StoreJson
{
    public static JsonSerializerOptions Options { get; } = Create();

    public static string Serialize<T>(T value) => JsonSerializer.Serialize(value, Options);

    public static T? Deserialize<T>(string? json) => json is null ? default : JsonSerializer.Deserialize<T>(json, Options);

    /// <summary>The snake_case text of an enum value, as stored in text columns ("first_runs", "critical").</summary>
    public static string EnumText<T>(T value)
        where T : struct, Enum => JsonNamingPolicy.SnakeCaseLower.ConvertName(value.ToString());

    public static T ParseEnum<T>(string text)
        where T : struct, Enum =>
        Enum.TryParse<T>(text.Replace("_", string.Empty, StringComparison.Ordinal), ignoreCase: true, out var value)
            ? value
            : throw new FormatException($"'{text}' is not a known {typeof(T).Name}.");

    private static JsonSerializerOptions Create()
    {
        var options = new JsonSerializerOptions
        {
            PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
            NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
            WriteIndented = false,
        };
        options.Converters.Add(new JsonStringEnumConverter(JsonNamingPolicy.SnakeCaseLower));
        options.MakeReadOnly(populateMissingResolver: true);
        return options;
    }
}
