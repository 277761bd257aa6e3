using System.Globalization;
using Npgsql;
using Testcontainers.PostgreSql;

namespace DriftWatch.IntegrationTests.Infrastructure;

/// <summary>
/// The real PostgreSQL server the integration tests use, shared by every class in <see cref="UsesPostgres"/>.
/// <list type="number">
/// <item><c>DRIFTWATCH_TEST_PG</c> set: that server (a role that may CREATE DATABASE and CREATE ROLE).</item>
/// <item>Else a Docker engine answers: a throwaway container (Testcontainers).</item>
/// <item>Else every test of the collection fails with a message saying how to get a server. Never a silent skip.</item>
/// </list>
/// Tests work in their own database from <see cref="CreateDatabaseAsync"/>.
/// </summary>
public sealed class PostgresServer : IAsyncLifetime
{
    public const string EnvironmentVariable = "DRIFTWATCH_TEST_PG";
    public const string ContainerImage = "postgres:15-alpine";

    private PostgreSqlContainer? _container;
    private string? _adminConnectionString;

    /// <summary>Connection string of the server's maintenance database; tests should prefer their own database.</summary>
    public string AdminConnectionString => _adminConnectionString ?? throw new InvalidOperationException("The PostgreSQL server has not started.");

    public async Task InitializeAsync()
    {
        var configured = Environment.GetEnvironmentVariable(EnvironmentVariable);
        if (!string.IsNullOrWhiteSpace(configured))
        {
            _adminConnectionString = configured;
            await CheckReachableAsync(configured, $"{EnvironmentVariable} is set but the server does not answer");
            return;
        }

        var ci = string.Equals(Environment.GetEnvironmentVariable("CI"), "true", StringComparison.OrdinalIgnoreCase);
        if (!DockerLooksAvailable())
        {
            throw new InvalidOperationException(
                $"No PostgreSQL for the integration tests: {EnvironmentVariable} is not set and no Docker engine was found. " +
                (ci ? "Under CI=true this is a failure, not a skip. " : string.Empty) +
                "Run `bash tests/run-all.sh` (it starts a throwaway server) or set " + EnvironmentVariable +
                " to an Npgsql connection string of a server where tests may CREATE DATABASE.");
        }

        try
        {
            _container = new PostgreSqlBuilder(ContainerImage).Build();
            await _container.StartAsync();
            _adminConnectionString = _container.GetConnectionString();
        }
        catch (Exception e)
        {
            throw new InvalidOperationException(
                $"A Docker engine seems present but the PostgreSQL container ({ContainerImage}) did not start: {e.Message}. " +
                $"Run `bash tests/run-all.sh` or set {EnvironmentVariable}.", e);
        }
    }

    public async Task DisposeAsync()
    {
        NpgsqlConnection.ClearAllPools();
        if (_container is not null)
        {
            await _container.DisposeAsync();
        }
    }

    /// <summary>
    /// A fresh, empty database (dw_ + random hex) and its connection string. Parallel aggregates are switched
    /// off in it so figures such as corr() are bit-for-bit repeatable (RECIPES.md). Drop it with <see cref="DropDatabaseAsync"/>.
    /// </summary>
    public async Task<string> CreateDatabaseAsync(CancellationToken cancellationToken = default)
    {
        var name = "dw_" + Guid.NewGuid().ToString("N")[..16];
        await ExecuteAdminAsync($"CREATE DATABASE {name}", cancellationToken);
        await ExecuteAdminAsync($"ALTER DATABASE {name} SET max_parallel_workers_per_gather = 0", cancellationToken);
        return new NpgsqlConnectionStringBuilder(AdminConnectionString) { Database = name, Pooling = true }.ToString();
    }

    public async Task DropDatabaseAsync(string connectionString, CancellationToken cancellationToken = default)
    {
        var name = new NpgsqlConnectionStringBuilder(connectionString).Database!;
        NpgsqlConnection.ClearAllPools();
        await ExecuteAdminAsync($"DROP DATABASE IF EXISTS \"{name.Replace("\"", "\"\"", StringComparison.Ordinal)}\" WITH (FORCE)", cancellationToken);
    }

    /// <summary>A login role with no privileges beyond PUBLIC's; connection string for <paramref name="database"/> as that role.</summary>
    public async Task<string> CreateRoleAsync(string roleName, string databaseConnectionString, CancellationToken cancellationToken = default)
    {
        await ExecuteAdminAsync($"CREATE ROLE {roleName} LOGIN PASSWORD 'role-secret-{roleName}'", cancellationToken);
        return new NpgsqlConnectionStringBuilder(databaseConnectionString) { Username = roleName, Password = $"role-secret-{roleName}" }.ToString();
    }

    public Task DropRoleAsync(string roleName, CancellationToken cancellationToken = default) =>
        ExecuteAdminAsync($"DROP ROLE IF EXISTS {roleName}", cancellationToken);

    public async Task ExecuteAdminAsync(string sql, CancellationToken cancellationToken = default)
    {
        await using var connection = new NpgsqlConnection(AdminConnectionString);
        await connection.OpenAsync(cancellationToken);
        await using var command = new NpgsqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync(cancellationToken);
    }

    private static async Task CheckReachableAsync(string connectionString, string failure)
    {
        try
        {
            await using var connection = new NpgsqlConnection(connectionString);
            await connection.OpenAsync();
        }
        catch (Exception e) when (e is NpgsqlException or ArgumentException)
        {
            var builder = new NpgsqlConnectionStringBuilder(connectionString);
            throw new InvalidOperationException($"{failure} ({builder.Host}:{builder.Port.ToString(CultureInfo.InvariantCulture)}: {e.Message}).", e);
        }
    }

    private static bool DockerLooksAvailable() =>
        !string.IsNullOrEmpty(Environment.GetEnvironmentVariable("DOCKER_HOST"))
        || File.Exists("/var/run/docker.sock")
        || (OperatingSystem.IsWindows() && File.Exists(@"\\.\pipe\docker_engine"));
}

/// <summary>Test classes that need PostgreSQL join this collection: <c>[Collection(UsesPostgres.Name)]</c> and take <see cref="PostgresServer"/> in their constructor.</summary>
[CollectionDefinition(Name)]
public sealed class UsesPostgres : ICollectionFixture<PostgresServer>
{
    public const string Name = "PostgreSQL";
}
