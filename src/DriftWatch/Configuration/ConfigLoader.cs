using DriftWatch.Core.Configuration;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace DriftWatch.Configuration;

/// <summary>
/// Reads the YAML configuration into a validated <see cref="DriftWatchConfig"/>. Never throws for bad input:
/// every problem found is returned, each naming file, line, column and key path, none quoting a secret.
/// </summary>
internal static class ConfigLoader
{
    /// <summary>A configuration is a few kilobytes; a larger file is a mistake or an attack.</summary>
    public const int MaxFileBytes = 1024 * 1024;

    /// <param name="env">Looks up ${NAME}; pass <see cref="Environment.GetEnvironmentVariable(string)"/> in production.</param>
    /// <param name="offline">
    /// Check the file without its secrets: an unset variable in a secret key or an unreadable password file is listed in
    /// <see cref="ConfigLoadResult.NotChecked"/>, not reported as an error. The config it returns is for validation only.
    /// </param>
    public static ConfigLoadResult Load(string path, Func<string, string?> env, bool offline = false)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(env);
        string text;
        string fullPath;
        try
        {
            fullPath = Path.GetFullPath(path);
            var info = new FileInfo(fullPath);
            if (!info.Exists)
            {
                return FileError(path, "cannot read the configuration: no such file");
            }

            // The length a file reports is not trusted (a device or a pipe reports 0): the read itself stops at the limit.
            if (BoundedFile.ReadText(fullPath, MaxFileBytes) is not { } read)
            {
                return FileError(path, $"the file is larger than {MaxFileBytes} bytes (1 MiB), the most a configuration may have; reading stopped there");
            }

            text = read;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or ArgumentException or NotSupportedException)
        {
            return FileError(path, $"cannot read the configuration: {ex.Message}");
        }

        var result = Parse(text, path, env, Path.GetDirectoryName(fullPath), offline);
        return result.Config is null ? result : result with { Config = result.Config with { FilePath = fullPath } };
    }

    /// <param name="fileName">Used in messages and pair locations.</param>
    /// <param name="baseDirectory">Where relative paths start; the current directory when null.</param>
    public static ConfigLoadResult Parse(string yamlText, string fileName, Func<string, string?> env, string? baseDirectory = null, bool offline = false)
    {
        ArgumentNullException.ThrowIfNull(yamlText);
        ArgumentNullException.ThrowIfNull(fileName);
        ArgumentNullException.ThrowIfNull(env);
        if (yamlText.Length > MaxFileBytes)
        {
            return FileError(fileName, $"the text has {yamlText.Length} characters; a configuration may have at most {MaxFileBytes}");
        }

        var context = new ConfigContext(fileName, Path.GetFullPath(baseDirectory ?? Environment.CurrentDirectory), env, offline);
        var root = LoadRoot(yamlText, context);
        if (root is null)
        {
            return new ConfigLoadResult(null, context.SortedErrors());
        }

        var config = Map(root);
        return context.ErrorCount == 0
            ? new ConfigLoadResult(config, []) { NotChecked = context.NotChecked }
            : new ConfigLoadResult(null, context.SortedErrors()) { NotChecked = context.NotChecked };
    }

    private static MappingReader? LoadRoot(string yamlText, ConfigContext context)
    {
        if (!YamlGuard.Check(yamlText, context))
        {
            return null;
        }

        var stream = new YamlStream();
        try
        {
            stream.Load(new StringReader(yamlText));
        }
        catch (YamlException ex)
        {
            // What the guard's event pass cannot see: duplicate keys in one mapping.
            context.Error(ex.Start, ConfigContext.FileKey, $"YAML: {ex.Message}");
            return null;
        }

        if (stream.Documents.Count == 0 || YamlNodes.IsNull(stream.Documents[0].RootNode))
        {
            context.Error(1, 1, ConfigContext.FileKey, "the configuration is empty; it needs at least sources and pairs");
            return null;
        }

        return MappingReader.Open(context, stream.Documents[0].RootNode, string.Empty, ConfigKeys.Root);
    }

    /// <summary>Sections in dependency order: pairs need the sources, mailing lists and store read before them.</summary>
    private static DriftWatchConfig Map(MappingReader root)
    {
        var context = root.Context;
        var sources = SourcesSection.Read(root, out var declaredSources);
        var store = StoreSection.Read(context, root.Mapping("store", ConfigKeys.Store));
        var alerting = AlertingSection.Read(root.Mapping("alerting", ConfigKeys.Alerting), out var declaredLists);
        var defaults = DefaultsSection.Read(root.Mapping("defaults", ConfigKeys.Defaults));
        var pairs = PairsSection.Read(root, defaults, sources, declaredSources, declaredLists, store);
        var dashboard = DashboardSection.Read(root.Mapping("dashboard", ConfigKeys.Dashboard));
        var logging = LoggingSection.Read(root.Mapping("logging", ConfigKeys.Logging));
        var worker = WorkerSection.Read(context, root.Mapping("worker", ConfigKeys.Worker), store);
        root.Done();
        return new DriftWatchConfig
        {
            Sources = sources,
            Store = store,
            Pairs = pairs,
            Alerting = alerting,
            Dashboard = dashboard,
            Logging = logging,
            Worker = worker,
        };
    }

    private static ConfigLoadResult FileError(string file, string message) =>
        new(null, [new ConfigError(file, 0, 0, ConfigContext.FileKey, message)]);
}
