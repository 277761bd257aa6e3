using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary><c>logging:</c> console format, optional file and minimum level.</summary>
internal static class LoggingSection
{
    /// <summary>Serilog's level names, as the host expects them.</summary>
    public static readonly (string Name, string Value)[] Levels =
    [
        ("verbose", "Verbose"),
        ("debug", "Debug"),
        ("information", "Information"),
        ("warning", "Warning"),
        ("error", "Error"),
        ("fatal", "Fatal"),
    ];

    public static LoggingConfig Read(MappingReader? reader)
    {
        var defaults = new LoggingConfig();
        if (reader is null)
        {
            return defaults;
        }

        var format = reader.Choice("format", ("text", LogFormat.Text), ("json", LogFormat.Json)) ?? defaults.Format;
        var file = reader.Text("file");
        var level = ReadLevel(reader) ?? defaults.MinimumLevel;
        reader.Done();
        return new LoggingConfig
        {
            Format = format,
            File = file is null ? null : reader.Context.ResolvePath(file),
            MinimumLevel = level,
        };
    }

    private static string? ReadLevel(MappingReader reader)
    {
        var text = reader.Text("level");
        if (text is null)
        {
            return null;
        }

        foreach (var (name, value) in Levels)
        {
            if (string.Equals(name, text, StringComparison.OrdinalIgnoreCase))
            {
                return value;
            }
        }

        reader.Error("level", $"must be one of {string.Join(", ", Levels.Select(l => l.Name))}; was '{text}'");
        return null;
    }
}
