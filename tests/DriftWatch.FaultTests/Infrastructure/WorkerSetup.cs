using System.Globalization;
using System.Text;

namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>One watched pair of the bench's source: a table or view with columns km and litres.</summary>
public sealed record PairSpec(string Name, string Table, string Schedule = "* * * * * ?");

/// <summary>
/// What the bench writes as the worker's YAML. A record, so a fault that edits the configuration (a live reload)
/// renders a changed copy (<c>setup with { … }</c>) or <see cref="ExtraYaml"/> over the same file.
/// </summary>
public sealed record WorkerSetup
{
    public IReadOnlyList<PairSpec> Pairs { get; init; } = [];

    public int CheckFailingAfter { get; init; } = 2;

    public string StopGrace { get; init; } = "2s";

    /// <summary>Short, so alert cycles follow the one-second schedules closely.</summary>
    public string AlertEvery { get; init; } = "1s";

    /// <summary>Further items of <c>alerting.mailing_lists</c>, verbatim, indented as list items under it (4 spaces, "- ").</summary>
    public string ExtraMailingLists { get; init; } = string.Empty;

    /// <summary>Appended verbatim at the end (top-level sections the bench does not write itself).</summary>
    public string ExtraYaml { get; init; } = string.Empty;

    public string Render(string sourceConnection, string storeConnection, int smtpPort, int dashboardPort)
    {
        var yaml = new StringBuilder();
        yaml.Append(CultureInfo.InvariantCulture, $"""
            sources:
              - name: depot
                kind: postgres
                connection: '{sourceConnection}'
                statement_timeout: 10m
            store:
              kind: postgres
              connection: '{storeConnection}'
            pairs:

            """);
        foreach (var pair in Pairs)
        {
            yaml.Append(CultureInfo.InvariantCulture, $"""
                  - name: {pair.Name}
                    source: depot
                    table: {pair.Table}
                    x: km
                    y: litres
                    schedule: "{pair.Schedule}"

                """);
        }

        yaml.Append(CultureInfo.InvariantCulture, $"""
            alerting:
              smtp:
                host: 127.0.0.1
                port: {smtpPort}
                security: none
                from: DriftWatch <driftwatch@depot.example>
              mailing_lists:
                - name: fleet
                  recipients: [fleet@depot.example]
                  from_severity: info
            {ExtraMailingLists}  check_failing_after: {CheckFailingAfter}
            dashboard:
              enabled: true
              bind: 127.0.0.1
              port: {dashboardPort}
            worker:
              id: fault-bench
              stop_grace: {StopGrace}
              alert_every: {AlertEvery}

            """);
        yaml.Append(ExtraYaml);
        return yaml.ToString();
    }
}
