using System.CommandLine;

namespace DriftWatch.Calibration.Running;

/// <summary>
/// What one calibration run simulates. Days count from 1; days 1..BaselineDays build the baseline (the default
/// <c>first_runs: 5</c>), the rest are monitored; faults start on <see cref="FaultDay"/> and last to the end.
/// </summary>
/// <param name="Postgres">An Npgsql connection string of a server where the run may CREATE DATABASE; null: a SQLite source.</param>
/// <param name="Quick">Each fault type at its main size only, and no 300k-row table.</param>
internal sealed record CalibrationOptions(
    int PairsPerFamily,
    int Days,
    int BaselineDays,
    int FaultDay,
    int Seed,
    string? Postgres,
    string? JsonPath,
    bool Quick)
{
    /// <summary>Leave the run's folder (source, store, configuration) in place and print its path, to look at with <c>driftwatch history</c>.</summary>
    public bool Keep { get; init; }

    public const int DefaultPairsPerFamily = 10;
    public const int DefaultDays = 25;
    public const int DefaultBaselineDays = 5;
    public const int DefaultFaultDay = 10;
    public const int DefaultSeed = 20_260_302;

    public const int QuickPairsPerFamily = 3;
    public const int QuickDays = 10;
    public const int QuickFaultDay = 7;

    /// <summary>The environment variable read by <c>--postgres</c>.</summary>
    public const string PostgresVariable = "DRIFTWATCH_BENCH_PG";

    public static CalibrationOptions Full { get; } = new(DefaultPairsPerFamily, DefaultDays, DefaultBaselineDays, DefaultFaultDay, DefaultSeed, null, null, false);

    /// <summary>The small preset the test suite runs: 3 pairs per family, 5 baseline + 5 monitored days, faults from day 7.</summary>
    public static CalibrationOptions QuickPreset { get; } = new(QuickPairsPerFamily, QuickDays, DefaultBaselineDays, QuickFaultDay, DefaultSeed, null, null, true);

    public int MonitoredDays => Days - BaselineDays;

    /// <returns>Problems with the options, empty when they can run.</returns>
    public IReadOnlyList<string> Problems()
    {
        var problems = new List<string>();
        if (PairsPerFamily < 1)
        {
            problems.Add($"--pairs-per-family must be at least 1, was {PairsPerFamily}");
        }

        if (BaselineDays < 1)
        {
            problems.Add($"--baseline-days must be at least 1, was {BaselineDays}");
        }

        if (Days <= BaselineDays)
        {
            problems.Add($"--days must exceed --baseline-days ({BaselineDays}), was {Days}");
        }

        if (FaultDay <= BaselineDays || FaultDay > Days)
        {
            problems.Add($"--fault-day must be a monitored day ({BaselineDays + 1}–{Days}), was {FaultDay}");
        }

        return problems;
    }

    /// <summary>The command line of <c>calibrate</c>; <c>--quick</c> changes the defaults of the options not given.</summary>
    public static RootCommand Command(Func<CalibrationOptions, CancellationToken, Task<int>> run)
    {
        var pairs = new Option<int?>("--pairs-per-family") { Description = $"Healthy pairs of each family (default {DefaultPairsPerFamily}, quick {QuickPairsPerFamily})." };
        var days = new Option<int?>("--days") { Description = $"Simulated days, baseline included (default {DefaultDays}, quick {QuickDays})." };
        var baseline = new Option<int>("--baseline-days") { Description = "Days that build the baseline (first_runs).", DefaultValueFactory = _ => DefaultBaselineDays };
        var faultDay = new Option<int?>("--fault-day") { Description = $"The day faults start (default {DefaultFaultDay}, quick {QuickFaultDay})." };
        var seed = new Option<int>("--seed") { Description = "Seed of every generator.", DefaultValueFactory = _ => DefaultSeed };
        var postgres = new Option<bool>("--postgres") { Description = $"Load the source data into a new PostgreSQL database on the server of {PostgresVariable} instead of a SQLite file." };
        var json = new Option<string?>("--json") { Description = "Also write the results as JSON to this file." };
        var quick = new Option<bool>("--quick") { Description = "The small preset: few pairs, each fault type at its main size, fewer days." };
        var keep = new Option<bool>("--keep") { Description = "Keep the run's folder (SQLite source and store, driftwatch.yaml) and print its path, to inspect runs with 'driftwatch history PAIR --config …'." };
        var command = new RootCommand("Calibration: healthy pair families and injected faults, day by day through the production check path; false findings, confirmed alerts and detection read back from the store.")
        {
            pairs, days, baseline, faultDay, seed, postgres, json, quick, keep,
        };
        command.SetAction((parse, ct) =>
        {
            var q = parse.GetValue(quick);
            string? pg = null;
            if (parse.GetValue(postgres))
            {
                pg = Environment.GetEnvironmentVariable(PostgresVariable);
                if (string.IsNullOrEmpty(pg))
                {
                    Console.Error.WriteLine($"--postgres needs {PostgresVariable}: an Npgsql connection string of a server where the run may CREATE DATABASE.");
                    return Task.FromResult(2);
                }
            }

            return run(
                new CalibrationOptions(
                    parse.GetValue(pairs) ?? (q ? QuickPairsPerFamily : DefaultPairsPerFamily),
                    parse.GetValue(days) ?? (q ? QuickDays : DefaultDays),
                    parse.GetValue(baseline),
                    parse.GetValue(faultDay) ?? (q ? QuickFaultDay : DefaultFaultDay),
                    parse.GetValue(seed),
                    pg,
                    parse.GetValue(json),
                    q)
                {
                    Keep = parse.GetValue(keep),
                },
                ct);
        });
        return command;
    }
}
