using MySqlConnector;

namespace DriftWatch.IntegrationTests.Infrastructure;

/// <summary>
/// A mysql source as an operator writes it: the connection string without its password in the configuration file,
/// the password in a file beside it (<c>password_file</c>).
/// </summary>
internal static class MySqlSourceYaml
{
    /// <summary>The source's <c>connection</c> and <c>password_file</c> lines (indented for a sources list item); writes the password file into <paramref name="folder"/>.</summary>
    public static string Lines(string connectionString, string folder, string fileName)
    {
        var builder = new MySqlConnectionStringBuilder(connectionString);
        var password = builder.Password;
        builder.Remove("Password");
        var lines = $"    connection: \"{builder.ConnectionString}\"";
        if (!string.IsNullOrEmpty(password))
        {
            File.WriteAllText(Path.Combine(folder, fileName), password + "\n");
            lines += $"\n    password_file: {fileName}";
        }

        return lines;
    }
}
