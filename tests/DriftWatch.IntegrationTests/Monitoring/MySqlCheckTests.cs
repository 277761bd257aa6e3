using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>A mysql pair (MariaDB) through the check pass, like a PostgreSQL pair; the password comes from the environment.</summary>
[Collection(UsesMariaDb.Name)]
public sealed class MySqlCheckTests(MariaDbServer server)
{
    [Fact]
    public async Task CopiedColumn_InMariaDbTable_IsBecamePerfect_AsOnPostgres()
    {
        var cs = await server.CreateDatabaseAsync();
        try
        {
            // Two weighings of each parcel: a deterministic ±1 kg scale error around the declared weight.
            await MariaDbServer.ExecuteAsync(cs, """
                CREATE TABLE parcels (declared_kg DOUBLE, weighed_kg DOUBLE);
                INSERT INTO parcels SELECT 100 + (seq * 37) % 900, 100 + (seq * 37) % 900 + (CAST((seq * 7919) % 200 AS SIGNED) - 100) / 100.0 FROM seq_1_to_2000;
                """);

            await PlantedCopyCheck.RunAsync(
                "    kind: mysql\n    connection: ${SOURCE_MYSQL}",
                "parcels",
                () => MariaDbServer.ExecuteAsync(cs, "UPDATE parcels SET weighed_kg = declared_kg"),
                new Dictionary<string, string> { ["SOURCE_MYSQL"] = cs });
        }
        finally
        {
            await server.DropDatabaseAsync(cs);
        }
    }
}
