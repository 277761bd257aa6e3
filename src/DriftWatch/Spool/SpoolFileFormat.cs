using System.Text.Json;
using DriftWatch.Core.History;
using DriftWatch.Store;

namespace DriftWatch.Spool;

/// <summary>
/// The spool's files: one JSON object per file, in the store's JSON conventions (<see cref="StoreJson"/>), with a
/// format number so a later version can read what an older worker left.
/// </summary>
internal static class SpoolFileFormat
{
    public const int Version = 1;

    public static byte[] Encode(NewRun run) => JsonSerializer.SerializeToUtf8Bytes(new RunFile(Version, run), StoreJson.Options);

    public static byte[] Encode(CheckMarker marker) => JsonSerializer.SerializeToUtf8Bytes(new MarkerFile(Version, marker), StoreJson.Options);

    /// <summary>The run in <paramref name="content"/>; throws <see cref="FormatException"/> naming what is wrong.</summary>
    public static NewRun DecodeRun(byte[] content) =>
        Decode<RunFile>(content) is { Format: Version, Run: { } run } ? run : throw new FormatException($"not a spooled run of format {Version}");

    public static CheckMarker DecodeMarker(byte[] content) =>
        Decode<MarkerFile>(content) is { Format: Version, Marker: { } marker } ? marker : throw new FormatException($"not a check marker of format {Version}");

    private static T? Decode<T>(byte[] content)
    {
        try
        {
            return JsonSerializer.Deserialize<T>(content, StoreJson.Options);
        }
        catch (Exception ex) when (ex is JsonException or NotSupportedException or ArgumentException or InvalidOperationException)
        {
            // Truncated by a crash, or edited by hand: a JSON error names the position (line, byte) that failed.
            throw new FormatException(ex.Message, ex);
        }
    }

    private sealed record RunFile(int Format, NewRun? Run);

    private sealed record MarkerFile(int Format, CheckMarker? Marker);
}
