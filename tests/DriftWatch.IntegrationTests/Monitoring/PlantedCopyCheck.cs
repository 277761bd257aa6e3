using DriftWatch.Hosting;
using DriftWatch.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.IntegrationTests.Alerting;
using DriftWatch.Monitoring;
using Microsoft.Extensions.DependencyInjection;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>
/// The check pass over a pair of any source kind, with the real SQLite store: two healthy checks form the
/// baseline, then a planted fault (the weighed column replaced by a copy of the declared one) must raise the
/// same finding as it does on PostgreSQL (<see cref="DuplicatedColumnEndToEndTests"/>): became_perfect, critical.
/// </summary>
internal static class PlantedCopyCheck
{
    /// <param name="sourceYaml">The source's kind and connection lines, indented for the sources list item.</param>
    /// <param name="table">The pair's table (a table name or a file glob).</param>
    public static async Task RunAsync(string sourceYaml, string table, Func<Task> plantCopy, IReadOnlyDictionary<string, string>? environment = null)
    {
        using var store = new TemporarySqliteStore();
        var yaml = $$"""
            sources:
              - name: watched
            {{sourceYaml}}
            store:
              kind: sqlite
              connection: {{store.DatabasePath}}
            pairs:
              - name: parcel-weights
                source: watched
                table: '{{table}}'
                x: declared_kg
                y: weighed_kg
                sample:
                  method: all
                baseline:
                  first_runs: 2
            """;
        var loaded = ConfigLoader.Parse(yaml, "e2e.yaml", name => environment is not null && environment.TryGetValue(name, out var v) ? v : null, store.Folder);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));
        var config = loaded.Config!;

        await using var services = await OneShotServices.StartAsync(config, verbose: false, CancellationToken.None);
        var pass = services.GetRequiredService<CheckPass>();
        for (var i = 0; i < 2; i++)
        {
            var healthy = await pass.RunAsync(config.Pairs, null, CancellationToken.None);
            var check = Assert.Single(healthy.Checks);
            Assert.NotNull(check.Profile);
            Assert.DoesNotContain(check.Findings, f => f.Severity >= Severity.Warning);
        }

        await plantCopy();
        var faulty = await pass.RunAsync(config.Pairs, null, CancellationToken.None);

        // y = x exactly gives r = 1 by definition (common practice): the same finding as on PostgreSQL.
        var finding = Assert.Single(faulty.Checks[0].Findings, f => f.Kind == FindingKind.BecamePerfect);
        Assert.Equal(Severity.Critical, finding.Severity);
        Assert.True(faulty.Checks[0].Profile!.ExactIdentity);
    }
}
