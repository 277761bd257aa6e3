namespace DriftWatch.Configuration;

/// <summary>One problem in a configuration file. Never carries a secret value (passwords, connection strings, tokens).</summary>
/// <param name="Line">1-based; 0 when the problem has no position (the file could not be read).</param>
/// <param name="Column">1-based; 0 when the problem has no position.</param>
/// <param name="Key">The key path, e.g. <c>pairs[2].sample.rows</c>; <c>(file)</c> for the file as a whole.</param>
internal sealed record ConfigError(string File, int Line, int Column, string Key, string Message)
{
    /// <summary><c>file:line:column: key: message</c>; <c>file: message</c> for a problem of the whole file (no position to give).</summary>
    public override string ToString() => Line == 0 ? $"{File}: {Message}" : $"{File}:{Line}:{Column}: {Key}: {Message}";
}
