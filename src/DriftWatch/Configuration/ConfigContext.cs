using YamlDotNet.Core;

namespace DriftWatch.Configuration;

/// <summary>What every section reader shares: the file's name for messages, where relative paths start, the environment and the error list.</summary>
internal sealed class ConfigContext(string fileName, string baseDirectory, Func<string, string?> env)
{
    public const string FileKey = "(file)";

    private readonly List<ConfigError> _errors = [];

    public string FileName { get; } = fileName;

    /// <summary>Absolute; relative paths in the file (SQLite files, password files, folders) resolve against it.</summary>
    public string BaseDirectory { get; } = baseDirectory;

    public Func<string, string?> Env { get; } = env;

    public int ErrorCount => _errors.Count;

    public void Error(Mark at, string key, string message) =>
        _errors.Add(new ConfigError(FileName, ToInt(at.Line), ToInt(at.Column), key, message));

    public void Error(int line, int column, string key, string message) =>
        _errors.Add(new ConfigError(FileName, line, column, key, message));

    public string ResolvePath(string path) => Path.GetFullPath(path, BaseDirectory);

    /// <summary>In file order, so a reader can go through them top to bottom.</summary>
    public IReadOnlyList<ConfigError> SortedErrors() =>
        [.. _errors.OrderBy(e => e.Line).ThenBy(e => e.Column)];

    private static int ToInt(long value) => value > int.MaxValue ? int.MaxValue : (int)value;
}
