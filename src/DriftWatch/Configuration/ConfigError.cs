namespace DriftWatch.Configuration;

/// <summary>One problem in a configuration file. Never carries a secret value (passwords, connection strings, tokens).</summary>
/// <param name="Line">1-based; 0 when the problem has no position (the file could not be read).</param>
/// <param name="Column">1-based; 0 when the problem has no position.</param>
/// <param name="Key">The key path, e.g. <c>pairs[2].sample.rows</c>; <c>(file)</c> for the file as a whole.</param>
internal sealed record ConfigError(string File, int Line, int Column, string Key, string Message)
{
    public override string ToString() => $"{File}:{Line}:{Column}: {Key}: {Message}";
}
