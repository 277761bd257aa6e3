using System.Data.Common;
using System.Globalization;
using System.Reflection;
using Dapper;

namespace DriftWatch.Store;

/// <summary>
/// Applies the embedded, numbered SQL scripts under Store/Migrations/{dialect}/ in order, each in its own
/// transaction, recording them in schema_migrations. Safe to run at every start and from several
/// instances at once (PostgreSQL: an advisory lock; SQLite: the write lock of BEGIN IMMEDIATE).
/// </summary>
internal sealed class MigrationRunner(IStoreDatabase database, TimeProvider? time = null)
{
    // Any fixed 64-bit number; identifies "driftwatch schema migration" among advisory locks.
    private const long AdvisoryLockKey = 0x44_72_69_66_74_57_01;

    public async Task<IReadOnlyList<string>> MigrateAsync(CancellationToken cancellationToken)
    {
        var scripts = LoadScripts(database.Dialect);
        var applied = new List<string>();
        await using var connection = await database.OpenAsync(cancellationToken);
        if (database.Dialect == StoreDialect.Postgres)
        {
            await connection.ExecuteAsync(new CommandDefinition("SELECT pg_advisory_lock(@k)", new { k = AdvisoryLockKey }, cancellationToken: cancellationToken));
        }

        if (database.Dialect == StoreDialect.Sqlite)
        {
            // SQLite's way to rebuild a table (004 does): foreign keys off outside the transaction, so dropping the
            // old table neither cascades into its children nor fails; each script is checked before it commits.
            await connection.ExecuteAsync(new CommandDefinition("PRAGMA foreign_keys=OFF", cancellationToken: cancellationToken));
        }

        try
        {
            await connection.ExecuteAsync(new CommandDefinition(
                "CREATE TABLE IF NOT EXISTS schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at_ms BIGINT NOT NULL)",
                cancellationToken: cancellationToken));
            var done = (await connection.QueryAsync<int>(new CommandDefinition("SELECT version FROM schema_migrations", cancellationToken: cancellationToken))).ToHashSet();
            foreach (var script in scripts.Where(s => !done.Contains(s.Version)))
            {
                await ApplyAsync(connection, script, cancellationToken);
                applied.Add(script.Name);
            }
        }
        finally
        {
            if (database.Dialect == StoreDialect.Postgres)
            {
                await connection.ExecuteAsync(new CommandDefinition("SELECT pg_advisory_unlock(@k)", new { k = AdvisoryLockKey }, cancellationToken: CancellationToken.None));
            }
            else
            {
                await connection.ExecuteAsync(new CommandDefinition("PRAGMA foreign_keys=ON", cancellationToken: CancellationToken.None));
            }
        }

        return applied;
    }

    private async Task ApplyAsync(DbConnection connection, MigrationScript script, CancellationToken cancellationToken)
    {
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(script.Sql, transaction: transaction, cancellationToken: cancellationToken));
        if (database.Dialect == StoreDialect.Sqlite)
        {
            var broken = (await connection.QueryAsync(new CommandDefinition("PRAGMA foreign_key_check", transaction: transaction, cancellationToken: cancellationToken))).Count();
            if (broken > 0)
            {
                throw new InvalidOperationException($"Migration {script.Name} left {broken} rows whose foreign key points nowhere; it was rolled back.");
            }
        }

        await connection.ExecuteAsync(new CommandDefinition(
            "INSERT INTO schema_migrations (version, name, applied_at_ms) VALUES (@Version, @Name, @At)",
            new { script.Version, script.Name, At = (time ?? TimeProvider.System).GetUtcNow().ToUnixTimeMilliseconds() },
            transaction,
            cancellationToken: cancellationToken));
        await transaction.CommitAsync(cancellationToken);
    }

    internal static IReadOnlyList<MigrationScript> LoadScripts(StoreDialect dialect)
    {
        var assembly = typeof(MigrationRunner).Assembly;
        // Resource names start with the root namespace (DriftWatch), not the assembly name (driftwatch).
        var prefix = $"{typeof(MigrationRunner).Namespace}.Migrations.{dialect.ToString().ToLowerInvariant()}.";
        var scripts = new List<MigrationScript>();
        foreach (var resource in assembly.GetManifestResourceNames().Where(n => n.StartsWith(prefix, StringComparison.Ordinal) && n.EndsWith(".sql", StringComparison.Ordinal)))
        {
            var name = resource[prefix.Length..^4];
            // Script names are "NNN_description"; the embedded-resource name mangles a leading digit to "_NNN".
            var digits = new string(name.TrimStart('_').TakeWhile(char.IsAsciiDigit).ToArray());
            var version = int.Parse(digits, CultureInfo.InvariantCulture);
            scripts.Add(new MigrationScript(version, name.TrimStart('_'), ReadResource(assembly, resource)));
        }

        if (scripts.Count == 0)
        {
            // A build that lost its embedded scripts must not start against an empty schema.
            throw new InvalidOperationException($"No embedded migrations found under {prefix}*.sql.");
        }

        return [.. scripts.OrderBy(s => s.Version)];
    }

    private static string ReadResource(Assembly assembly, string name)
    {
        using var stream = assembly.GetManifestResourceStream(name) ?? throw new InvalidOperationException($"Embedded migration {name} is missing.");
        using var reader = new StreamReader(stream);
        return reader.ReadToEnd();
    }
}

internal sealed record MigrationScript(int Version, string Name, string Sql);
