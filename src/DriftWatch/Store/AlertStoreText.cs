using System.Collections.Frozen;
using System.Text.Json;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;

namespace DriftWatch.Store;

/// <summary>The text forms the alert tables store: enums in snake_case (as their docs promise), times in Unix ms.</summary>
internal static class AlertStoreText
{
    private static readonly FrozenDictionary<string, FindingKind> Kinds = Map<FindingKind>();
    private static readonly FrozenDictionary<string, Severity> Severities = Map<Severity>();
    private static readonly FrozenDictionary<string, AlertStatus> Statuses = Map<AlertStatus>();
    private static readonly FrozenDictionary<string, ChannelKind> Channels = Map<ChannelKind>();

    public static string Name<T>(T value)
        where T : struct, Enum => StoreJson.EnumText(value);

    public static FindingKind Kind(string text) => Parse(Kinds, text, "kind");

    public static Severity Severity(string text) => Parse(Severities, text, "severity");

    public static AlertStatus Status(string text) => Parse(Statuses, text, "status");

    public static ChannelKind Channel(string text) => Parse(Channels, text, "channel");

    public static long Ms(DateTimeOffset at) => at.ToUnixTimeMilliseconds();

    public static long? Ms(DateTimeOffset? at) => at?.ToUnixTimeMilliseconds();

    public static DateTimeOffset Time(long ms) => DateTimeOffset.FromUnixTimeMilliseconds(ms);

    public static DateTimeOffset? Time(long? ms) => ms is null ? null : DateTimeOffset.FromUnixTimeMilliseconds(ms.Value);

    public static string Recipients(IReadOnlyList<string> recipients) => JsonSerializer.Serialize(recipients);

    public static IReadOnlyList<string> Recipients(string json) => JsonSerializer.Deserialize<string[]>(json) ?? [];

    private static FrozenDictionary<string, T> Map<T>()
        where T : struct, Enum => Enum.GetValues<T>().ToFrozenDictionary(Name, v => v, StringComparer.Ordinal);

    private static T Parse<T>(FrozenDictionary<string, T> map, string text, string column) =>
        map.TryGetValue(text, out var value)
            ? value
            : throw new InvalidDataException($"The store holds an unknown {column} '{text}' (written by a newer DriftWatch?).");
}
