using Microsoft.Data.Sqlite;

namespace DriftWatch.IntegrationTests.Sources.Sqlite;

/// <summary>A SQLite database in a temporary file, written through its own read-write connection; deleted on dispose.</summary>
public sealed class SqliteFile : IDisposable
{
    public SqliteFile()
    {
        Path = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "dw-" + Guid.NewGuid().ToString("N") + ".db");
    }

    public string Path { get; }

    private string ReadWrite => new SqliteConnectionStringBuilder { DataSource = Path, Mode = SqliteOpenMode.ReadWriteCreate, Pooling = false }.ToString();

    public void Execute(string sql)
    {
        using var connection = new SqliteConnection(ReadWrite);
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        command.ExecuteNonQuery();
    }

    public T Scalar<T>(string sql)
    {
        using var connection = new SqliteConnection(ReadWrite);
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        return (T)Convert.ChangeType(command.ExecuteScalar()!, typeof(T), System.Globalization.CultureInfo.InvariantCulture);
    }

    public void Dispose()
    {
        foreach (var suffix in new[] { string.Empty, "-wal", "-shm", "-journal" })
        {
            File.Delete(Path + suffix);
        }
    }
}
