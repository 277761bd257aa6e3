using YamlDotNet.Core;

namespace DriftWatch.Configuration;

/// <summary>What every section reader shares: the file's name for messages, where relative paths start, the environment and the error list.</summary>
internal sealed class ConfigContext(string fileName, string baseDirectory, Func<string, string?> env, bool offline = false)
{
    public const string FileKey = "(file)";

    /// <summary>Stands in for a secret that is not available offline; long enough for every length rule a secret has.</summary>
    public const string OfflinePlaceholder = "not-checked-offline-placeholder";

    private readonly List<ConfigError> _errors = [];
    private readonly List<string> _notChecked = [];
    private readonly HashSet<string> _uncheckedKeys = new(StringComparer.Ordinal);

    public string FileName { get; } = fileName;

    /// <summary>Absolute; relative paths in the file (SQLite files, password files, folders) resolve against it.</summary>
    public string BaseDirectory { get; } = baseDirectory;

    public Func<string, string?> Env { get; } = env;

    public int ErrorCount => _errors.Count;

    /// <summary>
    /// Offline validation: secrets (environment variables named by secret keys, password files) need not be
    /// available; each one missing is listed in <see cref="NotChecked"/> instead of being an error.
    /// </summary>
    public bool Offline { get; } = offline;

    /// <summary>"key: why", one per secret that could not be read offline, in the order met.</summary>
    public IReadOnlyList<string> NotChecked => _notChecked;

    public void SkipOffline(string key, string why)
    {
        _notChecked.Add($"{key}: {why}");
        _uncheckedKeys.Add(key);
    }

    /// <summary>Whether the key's value holds a stand-in for a secret not available offline (its shape cannot be checked).</summary>
    public bool IsUnchecked(string key) => _uncheckedKeys.Contains(key);

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
