using Dapper;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>
/// A crash at a write inside a store transaction, simulated by the database itself: a trigger aborts the first
/// insert or update of one table, so the transaction never commits, exactly as if the process had died at that
/// statement. Nothing in the product knows about it.
/// </summary>
internal static class SimulatedCrash
{
    public const string Message = "simulated crash";

    public static async Task ArmAsync(IStoreDatabase database, string table)
    {
        await using var connection = await database.OpenAsync(CancellationToken.None);
        if (database.Dialect == StoreDialect.Postgres)
        {
            await connection.ExecuteAsync($"""
                CREATE OR REPLACE FUNCTION dw_simulated_crash() RETURNS trigger LANGUAGE plpgsql AS $$
                BEGIN RAISE EXCEPTION '{Message}'; END $$;
                CREATE TRIGGER dw_crash_{table} BEFORE INSERT OR UPDATE ON {table} FOR EACH ROW EXECUTE FUNCTION dw_simulated_crash();
                """);
        }
        else
        {
            await connection.ExecuteAsync($"""
                CREATE TRIGGER dw_crash_{table}_insert BEFORE INSERT ON {table} BEGIN SELECT RAISE(ABORT, '{Message}'); END;
                CREATE TRIGGER dw_crash_{table}_update BEFORE UPDATE ON {table} BEGIN SELECT RAISE(ABORT, '{Message}'); END;
                """);
        }
    }

    /// <summary>The restart: the fault is gone, the data are as the crash left them.</summary>
    public static async Task DisarmAsync(IStoreDatabase database, string table)
    {
        await using var connection = await database.OpenAsync(CancellationToken.None);
        await connection.ExecuteAsync(database.Dialect == StoreDialect.Postgres
            ? $"DROP TRIGGER dw_crash_{table} ON {table}"
            : $"DROP TRIGGER dw_crash_{table}_insert; DROP TRIGGER dw_crash_{table}_update;");
    }
}
