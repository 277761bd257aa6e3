using System.Globalization;
using System.Text;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Demo;

/// <summary>
/// Writes the DriftWatch configuration that watches the scenario, as a user would: a commented YAML file in the
/// demo folder that the runner then loads through the real loader (so the demo exercises the config path, and
/// the file can be used afterwards with <c>check</c>, <c>history</c> or the dashboard).
/// </summary>
internal static class DemoConfigFile
{
    public const string SourceName = "terminal";
    public const string MailingList = "ops-mailbox";

    /// <summary>The PostgreSQL variant reads its connection string from here, so no secret is written to the file.</summary>
    public const string PostgresVariable = "DRIFTWATCH_DEMO_PG";

    public static string Text(SourceKind sourceKind, int checkFailingAfter = AlertingConfig.DefaultCheckFailingAfter)
    {
        var postgres = sourceKind == SourceKind.Postgres;
        var tablePrefix = postgres ? PostgresScenarioDatabase.Schema + "." : string.Empty;
        var s = new StringBuilder();
        s.Append(CultureInfo.InvariantCulture, $"""
            # DriftWatch demo: {TerminalScenario.TerminalName}, an invented inland container terminal.
            # Written by 'driftwatch demo'; every key is described in docs/configuration.md.
            # The data is invented: each table gets one load a day, and five pairs are broken on purpose.
            # To look around afterwards:
            #   driftwatch history crane-hours-vs-moves --config <this file>
            #   driftwatch report --config <this file> --out <folder>

            sources:
              - name: {SourceName}

            """);
        if (postgres)
        {
            s.Append(CultureInfo.InvariantCulture, $$"""
                    kind: postgres
                    # Set {{PostgresVariable}} to the Npgsql connection string given to --postgres to reuse this file.
                    connection: ${{{PostgresVariable}}}

                """);
        }
        else
        {
            s.Append(CultureInfo.InvariantCulture, $"""
                    kind: sqlite
                    connection: {DemoFolder.ScenarioDatabaseFile}   # relative to this file

                """);
        }

        s.Append(CultureInfo.InvariantCulture, $"""

            store:
              kind: sqlite
              connection: {DemoFolder.StoreFile}

            defaults:
              # Daily, after the day's load. The demo does not wait for it: it moves its own clock to each day's
              # check time and runs the same check, store and alert code a scheduled run would.
              schedule: "0 30 23 * * ?"
              baseline:
                first_runs: {TerminalScenario.BaselineRuns}   # days 1-{TerminalScenario.BaselineRuns.ToString(CultureInfo.InvariantCulture)} are the baseline; comparisons start on day {(TerminalScenario.BaselineRuns + 1).ToString(CultureInfo.InvariantCulture)}

            pairs:

            """);
        foreach (var pair in TerminalScenario.Pairs)
        {
            var fault = TerminalScenario.Faults.Where(f => f.Pair == pair.Name).Select(f => $"day {f.Day}: {f.Description}").ToArray();
            s.Append(CultureInfo.InvariantCulture, $$"""
                  # {{pair.Relationship}}. {{(fault.Length == 0 ? "The control pair: nothing is injected, it must stay silent." : "Fault: " + string.Join("; ", fault) + ".")}}
                  - name: {{pair.Name}}
                    source: {{SourceName}}
                    table: {{tablePrefix}}{{pair.Table}}
                    x: {{pair.X}}
                    y: {{pair.Y}}
                    window: {column: {{pair.TimeColumn}}, last: 24h}   # each check sees that day's load only
                    declared: {direction: positive}
                    tags: [{{(fault.Length == 0 ? "control" : "faulty")}}]

                """);
        }

        s.Append(CultureInfo.InvariantCulture, $"""

            alerting:
              mailing_lists:
                # No mail server needed: each alert digest becomes an .eml file in {DemoFolder.MailFolder}/.
                - name: {MailingList}
                  channel: file
                  directory: {DemoFolder.MailFolder}
                  from_severity: warning
                  include_plot: true   # plots carry sampled data values out of the database
              warning_confirm_runs: 2
              critical_confirm_runs: 1
              # The demo checks once a day, so the default 24h would remind of every open alert in every day's mail.
              remind_every: 7d
              # The renamed table fails its check on days {TerminalScenario.RenameDay}, {TerminalScenario.RenameDay + 1} and {TerminalScenario.RenameDay + 2}: the third failure confirms check_failing.
              check_failing_after: {checkFailingAfter.ToString(CultureInfo.InvariantCulture)}

            dashboard:
              enabled: true
              bind: 127.0.0.1
              port: {DashboardConfig.DefaultPort.ToString(CultureInfo.InvariantCulture)}

            """);
        return s.ToString();
    }
}
