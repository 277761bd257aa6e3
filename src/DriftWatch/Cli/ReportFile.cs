using System.Text;

namespace DriftWatch.Cli;

/// <summary>
/// <c>--output FILE</c>: the report is written beside the file under a temporary name, flushed to disk and renamed
/// over it, so a CI job's artifact step reads the old report or the new one, never half of one.
/// </summary>
internal static class ReportFile
{
    /// <summary>Checked before any pair is checked, so a mistyped folder costs nothing (exit code 2).</summary>
    public static void CheckWritable(FileInfo file)
    {
        ArgumentNullException.ThrowIfNull(file);
        if (Directory.Exists(file.FullName))
        {
            throw new CliUsageException($"--output {file.FullName} is a folder; give a file name");
        }

        if (file.Directory is not { Exists: true })
        {
            throw new CliUsageException($"--output {file.FullName}: the folder {file.DirectoryName} does not exist");
        }
    }

    public static void Write(FileInfo file, string content)
    {
        ArgumentNullException.ThrowIfNull(file);
        ArgumentNullException.ThrowIfNull(content);
        var temporary = Path.Combine(file.DirectoryName ?? ".", $".{file.Name}.{Guid.NewGuid():N}.tmp");
        try
        {
            using (var stream = new FileStream(temporary, FileMode.CreateNew, FileAccess.Write, FileShare.None))
            {
                var bytes = new UTF8Encoding(encoderShouldEmitUTF8Identifier: false).GetBytes(content);
                stream.Write(bytes);
                stream.Flush(flushToDisk: true);
            }

            File.Move(temporary, file.FullName, overwrite: true);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            File.Delete(temporary);
            throw new CliUsageException($"could not write --output {file.FullName}: {ex.Message} (the runs are recorded in the store)", ex);
        }
    }
}
