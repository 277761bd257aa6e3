using System.Security.Cryptography;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Hosting;

/// <summary>
/// The configuration in force in the worker: the one it started with until a reload replaces it (see
/// <see cref="ConfigReloadService"/>). Readers take <see cref="Current"/> once per piece of work, so a check or an
/// alert cycle sees one configuration from start to end.
/// </summary>
internal sealed class LiveConfig
{
    private State _state;

    public LiveConfig(DriftWatchConfig config, string contentHash, DateTimeOffset loadedAt)
    {
        ArgumentNullException.ThrowIfNull(config);
        _state = new State(config, contentHash, loadedAt, null);
    }

    public DriftWatchConfig Current => Volatile.Read(ref _state).Config;

    /// <summary>What /healthz shows: the hash of the file's text in force, when it was loaded, the last reload's errors.</summary>
    public ConfigStatus Status
    {
        get
        {
            var state = Volatile.Read(ref _state);
            return new ConfigStatus(state.Config.FilePath, state.Hash, state.LoadedAt, state.LastError);
        }
    }

    public void Apply(DriftWatchConfig config, string contentHash, DateTimeOffset loadedAt)
    {
        ArgumentNullException.ThrowIfNull(config);
        Volatile.Write(ref _state, new State(config, contentHash, loadedAt, null));
    }

    public void Reject(ReloadError error)
    {
        ArgumentNullException.ThrowIfNull(error);
        var state = Volatile.Read(ref _state);
        Volatile.Write(ref _state, state with { LastError = error });
    }

    /// <summary>The SHA-256 of the file's text, lower-case hex: the same file gives the same hash on every machine.</summary>
    public static string Hash(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        return Convert.ToHexStringLower(SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(text)));
    }

    private sealed record State(DriftWatchConfig Config, string Hash, DateTimeOffset LoadedAt, ReloadError? LastError);
}

/// <summary>The configuration in force (snake_case in /healthz).</summary>
internal sealed record ConfigStatus(string? File, string Sha256, DateTimeOffset LoadedAt, ReloadError? LastReloadError);

/// <summary>A reload that was refused: when, and every error as <c>file:line:column: key: message</c>.</summary>
internal sealed record ReloadError(DateTimeOffset At, IReadOnlyList<string> Errors)
{
    public static ReloadError From(DateTimeOffset at, IEnumerable<ConfigError> errors) => new(at, [.. errors.Select(e => e.ToString())]);
}
