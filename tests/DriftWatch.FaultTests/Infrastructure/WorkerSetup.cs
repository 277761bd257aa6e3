using System.Globalization;
using System.Text;

namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>One watched pair of the bench's source: a table or view with columns km and litres.</summary>
/// <param name="Declared">Rendered as the pair's <c>declared:</c> flow mapping when given (for example <c>{direction: negative}</c>).</param>
public sealed record PairSpec(string Name, string Table, string Schedule = "* * * * * ?", string? Declared = null);

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

    /// <summary>
    /// Several workers on one file (<c>worker.shared_schedule</c>): each process gets its dashboard port, worker id and
    /// spool folder from its environment (<see cref="WorkerProcess.SharedEnvironment"/>), so the file, and its hash, is
    /// the same for all of them.
    /// </summary>
    public bool Shared { get; init; }

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
            if (pair.Declared is not null)
            {
                yaml.Append(CultureInfo.InvariantCulture, $"    declared: {pair.Declared}\n");
            }
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
              port: {(Shared ? "${DW_TEST_PORT}" : dashboardPort.ToString(CultureInfo.InvariantCulture))}
            worker:
              id: {(Shared ? "${DW_TEST_WORKER}" : "fault-bench")}
              stop_grace: {StopGrace}
              alert_every: {AlertEvery}

            """);
        if (Shared)
        {
            yaml.Append("""
                  shared_schedule: true
                  heartbeat: 1s
                  takeover_after: 5s
                  spool:
                    path: ${DW_TEST_SPOOL}

                """);
        }

        yaml.Append(ExtraYaml);
        return yaml.ToString();
    }
}
