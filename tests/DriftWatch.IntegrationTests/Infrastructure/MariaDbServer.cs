using MySqlConnector;

namespace DriftWatch.IntegrationTests.Infrastructure;

/// <summary>
/// The real MariaDB (or MySQL) server of the mysql source tests: <c>DRIFTWATCH_TEST_MYSQL</c>, a MySqlConnector
/// connection string of an account that may CREATE DATABASE (tests/run-all.sh starts a throwaway one). Unset:
/// every test of the collection fails with a message saying how to get a server; never a silent skip.
/// </summary>
public sealed class MariaDbServer : IAsyncLifetime
{
    public const string EnvironmentVariable = "DRIFTWATCH_TEST_MYSQL";

    private string? _admin;

    public string AdminConnectionString => _admin ?? throw new InvalidOperationException("The MariaDB server has not started.");

    public async Task InitializeAsync()
    {
        var configured = Environment.GetEnvironmentVariable(EnvironmentVariable);
        if (string.IsNullOrWhiteSpace(configured))
        {
            throw new InvalidOperationException(
                $"No MariaDB for the mysql source tests: {EnvironmentVariable} is not set. Run `bash tests/run-all.sh` (it starts a throwaway " +
                $"server) or set {EnvironmentVariable} to a MySqlConnector connection string of an account that may CREATE DATABASE.");
        }

        _admin = configured;
        await using var connection = new MySqlConnection(configured);
        await connection.OpenAsync();
    }

    public Task DisposeAsync()
    {
        MySqlConnection.ClearAllPools();
        return Task.CompletedTask;
    }

    /// <summary>A fresh database (dw_ + random hex) and the connection string that uses it.</summary>
    public async Task<string> CreateDatabaseAsync()
    {
        var name = "dw_" + Guid.NewGuid().ToString("N")[..16];
        await ExecuteAsync(AdminConnectionString, $"CREATE DATABASE {name}");
        return new MySqlConnectionStringBuilder(AdminConnectionString) { Database = name }.ConnectionString;
    }

    public async Task DropDatabaseAsync(string connectionString)
    {
        var name = new MySqlConnectionStringBuilder(connectionString).Database;
        await ExecuteAsync(AdminConnectionString, $"DROP DATABASE IF EXISTS `{name}`");
    }

    public static async Task ExecuteAsync(string connectionString, string sql)
    {
        await using var connection = new MySqlConnection(connectionString);
        await connection.OpenAsync();
        await using var command = new MySqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync();
    }
}

/// <summary>Test classes that need MariaDB join this collection and take <see cref="MariaDbServer"/> in their constructor.</summary>
[CollectionDefinition(Name)]
public sealed class UsesMariaDb : ICollectionFixture<MariaDbServer>
{
    public const string Name = "MariaDB";
}
