using System.Globalization;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace DriftWatch.Configuration;

/// <summary>
/// Reads one YAML mapping: refuses unknown keys (with a hint), expands ${ENV} in values, parses typed values
/// and reports every problem at the value's line and column under its key path. A value that is wrong is
/// reported once and read as absent, so one mistake does not cascade into "missing" errors.
/// </summary>
internal sealed class MappingReader
{
    private readonly KeyLevel _level;
    private readonly Dictionary<string, (YamlNode Key, YamlNode Value)> _entries = new(StringComparer.Ordinal);
    private readonly HashSet<string> _read = new(StringComparer.Ordinal);

    private MappingReader(ConfigContext context, YamlMappingNode node, string path, KeyLevel level)
    {
        Context = context;
        Path = path;
        Start = node.Start;
        _level = level;
        foreach (var (key, value) in node.Children)
        {
            if (key is not YamlScalarNode { Value: { } name })
            {
                context.Error(key.Start, path.Length == 0 ? ConfigContext.FileKey : path, $"keys must be plain names, was {YamlNodes.Describe(key)}");
                continue;
            }

            if (!level.Allows(name))
            {
                context.Error(key.Start, KeyPath(name), UnknownKey(name, level));
                continue;
            }

            _entries[name] = (key, value);
        }
    }

    public ConfigContext Context { get; }

    /// <summary>The key path of this mapping ("pairs[2].sample"); empty at the root.</summary>
    public string Path { get; }

    public Mark Start { get; }

    public static MappingReader? Open(ConfigContext context, YamlNode? node, string path, KeyLevel level)
    {
        if (node is null || YamlNodes.IsNull(node))
        {
            return null;
        }

        if (node is not YamlMappingNode mapping)
        {
            context.Error(node.Start, path.Length == 0 ? ConfigContext.FileKey : path,
                $"must be a mapping of keys ({string.Join(", ", level.Keys)}), was {YamlNodes.Describe(node)}");
            return null;
        }

        return new MappingReader(context, mapping, path, level);
    }

    /// <summary>One item of a list of mappings; an empty item is reported too.</summary>
    public static MappingReader? OpenItem(ConfigContext context, YamlNode node, string path, KeyLevel level, string needs)
    {
        if (YamlNodes.IsNull(node))
        {
            context.Error(node.Start, path, $"is empty; {needs}");
            return null;
        }

        return Open(context, node, path, level);
    }

    public string KeyPath(string key) => Path.Length == 0 ? key : $"{Path}.{key}";

    /// <summary>Present with a non-null value.</summary>
    public bool Has(string key) => _entries.TryGetValue(key, out var entry) && !YamlNodes.IsNull(entry.Value);

    public Mark MarkOf(string key) => _entries.TryGetValue(key, out var entry) ? entry.Value.Start : Start;

    public void Error(string key, string message) => Context.Error(MarkOf(key), KeyPath(key), message);

    /// <summary>For a required key that is absent: reported at the mapping that lacks it.</summary>
    public void Missing(string key, string message) => Context.Error(Start, KeyPath(key), message);

    public YamlNode? Node(string key)
    {
        _read.Add(key);
        return Has(key) ? _entries[key].Value : null;
    }

    /// <summary>A single value with ${ENV} expanded. A <paramref name="secret"/> is never quoted in a message.</summary>
    public string? Text(string key, bool secret = false)
    {
        var node = Node(key);
        return node is null ? null : TextOf(node, KeyPath(key), secret);
    }

    public string? TextOf(YamlNode node, string path, bool secret = false)
    {
        if (node is not YamlScalarNode scalar)
        {
            Context.Error(node.Start, path, $"must be a single value, was {YamlNodes.Describe(node)}");
            return null;
        }

        Func<string, string>? unset = null;
        if (secret && Context.Offline)
        {
            unset = name =>
            {
                Context.SkipOffline(path, $"environment variable {name} is not set; not checked offline");
                return ConfigContext.OfflinePlaceholder;
            };
        }

        var expanded = EnvExpander.Expand(scalar.Value ?? string.Empty, Context.Env, secret, out var problem, unset);
        if (expanded is null)
        {
            Context.Error(node.Start, path, problem!);
        }

        return expanded;
    }

    public int? Int(string key, int min, int max)
    {
        var value = Long(key, min, max);
        return value is null ? null : (int)value.Value;
    }

    public long? Long(string key, long min, long max)
    {
        var text = Text(key);
        if (text is null)
        {
            return null;
        }

        if (!long.TryParse(text, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out var value))
        {
            Error(key, $"must be a whole number, was '{text}'");
            return null;
        }

        if (value < min || value > max)
        {
            Error(key, value < min ? $"must be at least {min}, was {value}" : $"must be at most {max}, was {value}");
            return null;
        }

        return value;
    }

    public double? Double(string key, NumberRange range)
    {
        var text = Text(key);
        if (text is null)
        {
            return null;
        }

        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var value) || !double.IsFinite(value))
        {
            Error(key, $"must be a number, was '{text}'");
            return null;
        }

        if (!range.Contains(value))
        {
            Error(key, $"must be {range}, was {value.ToString("R", CultureInfo.InvariantCulture)}");
            return null;
        }

        return value;
    }

    public bool? Bool(string key)
    {
        var text = Text(key);
        switch (text)
        {
            case null:
                return null;
            case "true" or "True" or "TRUE":
                return true;
            case "false" or "False" or "FALSE":
                return false;
            default:
                Error(key, $"must be true or false, was '{text}'");
                return null;
        }
    }

    public TimeSpan? Duration(string key, TimeSpan min, TimeSpan max)
    {
        var text = Text(key);
        if (text is null)
        {
            return null;
        }

        if (!DurationSyntax.TryParse(text, out var value, out var problem))
        {
            Error(key, problem!);
            return null;
        }

        if (value < min || value > max)
        {
            Error(key, value < min
                ? $"must be at least {DurationSyntax.Format(min)}, was {text}"
                : $"must be at most {DurationSyntax.Format(max)}, was {text}");
            return null;
        }

        return value;
    }

    public T? Choice<T>(string key, params (string Name, T Value)[] options)
        where T : struct
    {
        var text = Text(key);
        if (text is null)
        {
            return null;
        }

        foreach (var (name, value) in options)
        {
            if (string.Equals(name, text, StringComparison.Ordinal))
            {
                return value;
            }
        }

        var names = options.Select(o => o.Name).ToArray();
        var hint = KeyHints.Closest(text, names);
        Error(key, $"must be one of {string.Join(", ", names)}; was '{text}'" + (hint is null ? string.Empty : $" (did you mean '{hint}'?)"));
        return null;
    }

    public MappingReader? Mapping(string key, KeyLevel level) => Open(Context, Node(key), KeyPath(key), level);

    /// <summary>The items of a list with their key paths ("pairs[2]"); a non-list is reported.</summary>
    public IReadOnlyList<(YamlNode Node, string Path)> Items(string key)
    {
        var node = Node(key);
        if (node is null)
        {
            return [];
        }

        if (node is not YamlSequenceNode sequence)
        {
            Error(key, $"must be a list (lines starting with '- '), was {YamlNodes.Describe(node)}");
            return [];
        }

        return [.. sequence.Children.Select((item, i) => (item, $"{KeyPath(key)}[{i}]"))];
    }

    /// <summary>A list of single values; one value alone is read as a list of one.</summary>
    public IReadOnlyList<(string Text, Mark At, string Path)> TextList(string key)
    {
        var node = Node(key);
        if (node is null)
        {
            return [];
        }

        if (node is YamlScalarNode)
        {
            var one = TextOf(node, KeyPath(key));
            return one is null ? [] : [(one, node.Start, KeyPath(key))];
        }

        var list = new List<(string, Mark, string)>();
        foreach (var (item, path) in Items(key))
        {
            var text = TextOf(item, path);
            if (text is not null)
            {
                list.Add((text, item.Start, path));
            }
        }

        return list;
    }

    /// <summary>
    /// Reports a key this reader allowed but its section never read: configuration accepted and silently
    /// ignored is a bug, and the test of the complete example file finds it here.
    /// </summary>
    public void Done()
    {
        foreach (var key in _entries.Keys.Where(k => !_read.Contains(k)))
        {
            Error(key, "internal: this key is accepted but was not read; please report it");
        }
    }

    private static string UnknownKey(string name, KeyLevel level)
    {
        if (name == "<<")
        {
            return "YAML merge keys (<<) are not supported; use defaults: or repeat the keys";
        }

        if (level.Renamed.TryGetValue(name, out var renamed))
        {
            var inside = level.Child(renamed) is { } child ? $" (same keys: {string.Join(", ", child.Keys)})" : string.Empty;
            return $"unknown key '{name}'; it is now '{renamed}'{inside}: write {renamed}: instead of {name}:";
        }

        var hint = KeyHints.Closest(name, level.Keys);
        if (hint is not null)
        {
            return $"unknown key '{name}'; did you mean '{hint}'?";
        }

        foreach (var (parent, child) in level.Children())
        {
            if (child.Allows(name))
            {
                return $"unknown key '{name}' here; did you mean '{parent}.{name}'? ('{name}' belongs under '{parent}:')";
            }
        }

        return $"unknown key '{name}'; allowed here: {string.Join(", ", level.Keys)}";
    }
}
