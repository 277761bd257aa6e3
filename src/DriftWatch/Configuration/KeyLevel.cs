namespace DriftWatch.Configuration;

/// <summary>
/// The keys allowed in one mapping of the file, and the level below each key that holds a mapping (or a
/// list of mappings). The readers check keys against it and the schema test compares the JSON Schema with
/// it, so the loader, the docs' schema and the hints cannot drift apart.
/// </summary>
internal sealed class KeyLevel
{
    private readonly Dictionary<string, KeyLevel?> _keys;

    public KeyLevel(string name, params (string Key, KeyLevel? Child)[] keys)
    {
        Name = name;
        Keys = [.. keys.Select(k => k.Key)];
        _keys = keys.ToDictionary(k => k.Key, k => k.Child, StringComparer.Ordinal);
    }

    public KeyLevel(string name, IEnumerable<string> keys)
        : this(name, [.. keys.Select(k => (k, (KeyLevel?)null))])
    {
    }

    /// <summary>What the level is called in messages and in the schema test ("pair", "sample").</summary>
    public string Name { get; }

    /// <summary>In the order the docs list them.</summary>
    public IReadOnlyList<string> Keys { get; }

    /// <summary>
    /// Keys this level once allowed, each with the key that replaced it: an old file then fails with a message
    /// that names the new key, not only "unknown key" (the new name is rarely close enough for a spelling hint).
    /// </summary>
    public IReadOnlyDictionary<string, string> Renamed { get; init; } = new Dictionary<string, string>(StringComparer.Ordinal);

    public bool Allows(string key) => _keys.ContainsKey(key);

    /// <summary>The level under <paramref name="key"/>, or null for a scalar or a list of scalars.</summary>
    public KeyLevel? Child(string key) => _keys.GetValueOrDefault(key);

    public IEnumerable<(string Key, KeyLevel Child)> Children() =>
        _keys.Where(k => k.Value is not null).Select(k => (k.Key, k.Value!));
}
