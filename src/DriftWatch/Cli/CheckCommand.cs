using System.CommandLine;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using DriftWatch.Output;
using Microsoft.Extensions.DependencyInjection;

namespace DriftWatch.Cli;

/// <summary>
/// <c>driftwatch check</c>: one pass now through the same code path as the scheduler (sample, profile,
/// compare, record, evaluate alerts, deliver), for a pipeline step right after a load.
/// </summary>
internal static class CheckCommand
{
    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var config = ConfigOption.Create();
        var pair = new Option<string?>("--pair", "-p") { Description = "Check only this pair (by its name in the configuration).", HelpName = "NAME" };
        var format = CheckOptions.Format();
        var (tags, failAt, output) = (CheckOptions.Tags(), CheckOptions.FailAt(), CheckOptions.Output());
        var verbose = VerboseOption.Create();
        var asOf = AsOfOption.Create();
        var command = new Command(
            "check",
            "Check every watched pair (or those named by --pair and --tag) now, record the runs, evaluate alerts and send what is due. " +
            "Exit code 0: healthy; 1: a finding at warning or worse (--fail-at); 2: configuration error; 3: a check failed to run or had nothing to measure.\n\n" +
            "Example (a pipeline step after the nightly load): driftwatch check --config /etc/driftwatch/driftwatch.yaml --format json\n" +
            "Example (a CI job's test report, one team's pairs): driftwatch check --tag billing --format junit --output reports/driftwatch.xml")
        {
            config, pair, format, verbose, asOf,
            tags, failAt, output,
        };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            var pairs = PairSelection.Select(loaded, parse.GetValue(pair), parse.GetValue(tags) ?? []);
            if (parse.GetValue(output) is { } file)
            {
                ReportFile.CheckWritable(file);
            }

            if (pairs.Count == 0)
            {
                console.WriteWarning($"{loaded.FilePath} watches no pairs; nothing to check.");
                return ExitCodes.Healthy;
            }

            await using var services = await OneShotServices.StartAsync(loaded, parse.GetValue(verbose), ct);
            var at = parse.GetValue(asOf);
            if (at is { } past)
            {
                AsOfOption.CheckInPast(past, services.GetRequiredService<TimeProvider>().GetUtcNow());
            }

            var progress = new ImmediateProgress<PairCheckResult>(r => console.Error.WriteLine(
                r.Status switch
                {
                    RunStatus.Failed => $"  failed  {r.Pair.Name}: {r.Error}",
                    RunStatus.Unmeasurable => $"  unmeasurable {r.Pair.Name}: {r.Error}",
                    RunStatus.Interrupted => $"  interrupted {r.Pair.Name}: {r.Error}",
                    _ => $"  checked {r.Pair.Name} ({r.Findings.Count} finding{(r.Findings.Count == 1 ? "" : "s")})",
                }));
            console.Error.WriteLine($"Checking {pairs.Count} pair{(pairs.Count == 1 ? "" : "s")}…");
            var pass = await services.GetRequiredService<CheckPass>().RunAsync(pairs, progress, at, ct);
            var results = pass.Checks;
            var failing = parse.GetValue(failAt) ?? CheckOptions.DefaultFailAt;
            var exit = ExitCodeOf(results, failing);
            if (pass.Notifications > 0 || pass.Delivery.Sent + pass.Delivery.Failed > 0)
            {
                console.Error.WriteLine(
                    $"Alerts: {pass.Notifications} notification(s), {pass.MessagesQueued} message(s) queued, {pass.Delivery.Sent} sent" +
                    (pass.Delivery.Failed > 0 ? $", {pass.Delivery.Failed} failed (kept in the outbox; retried later)" : ""));
            }
            CheckReport.Write(console, loaded, results, exit, parse.GetValue(format), failing, parse.GetValue(output));
            return exit;
        });
        return command;
    }

    /// <summary>
    /// A check that could not run, or ran and had nothing to measure, outranks findings: the pair's state is unknown.
    /// An empty window must never pass a pipeline step as healthy.
    /// </summary>
    internal static int ExitCodeOf(IReadOnlyList<PairCheckResult> results, Severity failAt = CheckOptions.DefaultFailAt)
    {
        if (results.Any(r => r.Status is RunStatus.Failed or RunStatus.Unmeasurable or RunStatus.Interrupted))
        {
            return ExitCodes.RunFailures;
        }

        return results.Any(r => r.Findings.Any(f => f.Severity >= failAt)) ? ExitCodes.Findings : ExitCodes.Healthy;
    }
}
