using System.CommandLine;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>--config FILE, shared by every command that reads the YAML configuration.</summary>
internal static class ConfigOption
{
    public const string DefaultPath = "config/driftwatch.yaml";
    public const string EnvironmentVariable = "DRIFTWATCH_CONFIG";

    public static Option<string?> Create() => new("--config", "-c")
    {
        Description = $"The YAML configuration file (default: ${EnvironmentVariable}, else {DefaultPath}).",
        HelpName = "FILE",
    };

    /// <summary>Loads and validates the configuration; prints every error (file:line:column: key: message) and returns null on failure.</summary>
    public static DriftWatchConfig? Load(string? path, CliConsole console) => Load(path, console, offline: false);

    /// <param name="offline">Secrets need not be available; each one missing is printed as "not checked offline".</param>
    public static DriftWatchConfig? Load(string? path, CliConsole console, bool offline)
    {
        ArgumentNullException.ThrowIfNull(console);
        path ??= Environment.GetEnvironmentVariable(EnvironmentVariable);
        path = string.IsNullOrWhiteSpace(path) ? DefaultPath : path;
        if (!File.Exists(path))
        {
            // Said in so many words: the loader's file:line:column form has no position to give for a missing file.
            console.WriteError(Directory.Exists(path) ? $"config file not found: {path} is a folder" : $"config file not found: {path}");
            console.Error.WriteLine($"Give one with --config FILE or ${EnvironmentVariable}; nothing was checked.");
            return null;
        }

        var result = ConfigLoader.Load(path, Environment.GetEnvironmentVariable, offline);
        foreach (var error in result.Errors)
        {
            console.WriteError(error.ToString());
        }

        foreach (var skipped in result.NotChecked)
        {
            console.WriteNote(skipped);
        }

        if (!result.Ok)
        {
            console.Error.WriteLine(result.Errors.Count == 1
                ? "1 configuration error; nothing was checked."
                : $"{result.Errors.Count} configuration errors; nothing was checked.");
            return null;
        }

        return result.Config;
    }
}
