namespace DriftWatch.Demo;

/// <summary>
/// The demo's output folder, recreated on every run. Only a folder the demo made itself (it holds
/// <see cref="MarkerFile"/>) or an empty one is ever used: anything else is refused, never deleted.
/// </summary>
internal static class DemoFolder
{
    public const string DefaultPath = "demo-out";
    public const string MarkerFile = ".driftwatch-demo";
    public const string ScenarioDatabaseFile = "terminal.db";
    public const string StoreFile = "driftwatch.db";
    public const string ConfigFile = "driftwatch.yaml";
    public const string MailFolder = "mail";
    public const string ReportFolder = "report";

    /// <summary>Empties or creates the folder and marks it; returns its full path.</summary>
    public static string Prepare(string path)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        var full = Path.TrimEndingDirectorySeparator(Path.GetFullPath(path));
        if (File.Exists(full))
        {
            throw new DemoException($"{full} is a file; --out needs a folder.");
        }

        if (Directory.Exists(full))
        {
            if (string.Equals(full, Path.TrimEndingDirectorySeparator(Path.GetPathRoot(full) ?? string.Empty), StringComparison.Ordinal))
            {
                throw new DemoException($"{full} is the root of a file system; choose a folder for the demo's output.");
            }

            if (File.Exists(Path.Combine(full, MarkerFile)))
            {
                // A previous demo in this process (a test, --serve) may still pool connections to the store file
                // deleted here; one of them handed to the next run would see the old, unlinked file while new
                // connections see the new, empty one ("no such table").
                Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
                Directory.Delete(full, recursive: true);
            }
            else if (Directory.EnumerateFileSystemEntries(full).Any())
            {
                throw new DemoException(
                    $"{full} exists and does not look like a previous demo's output (no {MarkerFile} file in it); " +
                    "the demo does not delete it. Choose another folder with --out, or empty this one yourself.");
            }
        }

        Directory.CreateDirectory(full);
        File.WriteAllText(
            Path.Combine(full, MarkerFile),
            "Output of 'driftwatch demo': invented data. The next demo run deletes and recreates this folder.\n");
        return full;
    }
}
