namespace DriftWatch.Configuration;

/// <summary>Reads a secret from a file (a mounted secret, a file only the service user may read).</summary>
internal static class SecretFiles
{
    /// <summary>Secrets are short; a large file is a wrong path, not a password.</summary>
    public const int MaxBytes = 64 * 1024;

    /// <summary>The file's text without its trailing line break(s), or null with a problem that names the path, never the content.</summary>
    public static string? Read(string path, out string? problem)
    {
        problem = null;
        try
        {
            var info = new FileInfo(path);
            if (!info.Exists)
            {
                problem = $"cannot read '{path}': no such file";
                return null;
            }

            if (BoundedFile.ReadText(path, MaxBytes) is not { } read)
            {
                problem = $"'{path}' is larger than {MaxBytes} bytes; that is not a secret file";
                return null;
            }

            var text = read.TrimEnd('\r', '\n');
            if (text.Length == 0)
            {
                problem = $"'{path}' is empty";
                return null;
            }

            return text;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            problem = $"cannot read '{path}': {ex.GetType().Name}";
            return null;
        }
    }
}
