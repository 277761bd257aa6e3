using System.CommandLine;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>The options of <c>cycle</c>; every default is the case the issue asks for.</summary>
internal sealed record CycleOptions(
    int Pairs,
    int Tables,
    int Rows,
    int Warmups,
    int Cycles,
    int? MaxConcurrentQueries,
    string? Window,
    bool Stages,
    bool DropData,
    bool RestartEachCycle)
{
    public static RootCommand Command(Func<CycleOptions, CancellationToken, Task<int>> run)
    {
        var pairs = new Option<int>("--pairs") { Description = "Column pairs in the configuration.", DefaultValueFactory = _ => 1000 };
        var tables = new Option<int>("--tables") { Description = "Tables the pairs are spread over.", DefaultValueFactory = _ => 10 };
        var rows = new Option<int>("--rows") { Description = "Rows per table.", DefaultValueFactory = _ => 1_000_000 };
        var warmups = new Option<int>("--warmups") { Description = "Cycles run first and not counted (the first builds the baselines).", DefaultValueFactory = _ => 1 };
        var cycles = new Option<int>("--cycles") { Description = "Measured cycles; the median is reported.", DefaultValueFactory = _ => 3 };
        var concurrent = new Option<int?>("--max-concurrent-queries") { Description = "The source's max_concurrent_queries; unset: the default." };
        var window = new Option<string?>("--window") { Description = "Give every pair window {column: ts, last: VALUE} (e.g. 1d); unset: whole-table pairs." };
        var stages = new Option<bool>("--stages") { Description = "After the cycles, time the stages of a check one by one (source, baseline read, engine, store write, alerts)." };
        var restart = new Option<bool>("--restart-each-cycle")
        {
            Description = "Start the services afresh before every cycle, as a restarted worker or a one-shot check does: nothing "
                + "remembered in memory, only what the store keeps (baselines, column hints).",
        };
        var drop = new Option<bool>("--drop-data") { Description = "Drop the generated database at the end (kept by default: loading it takes minutes)." };
        var command = new RootCommand("One monitor cycle of many pairs on PostgreSQL, through CheckPass as the check command and the scheduler run it.")
        {
            pairs, tables, rows, warmups, cycles, concurrent, window, stages, drop, restart,
        };
        command.SetAction((parse, ct) => run(
            new CycleOptions(
                parse.GetValue(pairs),
                parse.GetValue(tables),
                parse.GetValue(rows),
                parse.GetValue(warmups),
                parse.GetValue(cycles),
                parse.GetValue(concurrent),
                parse.GetValue(window),
                parse.GetValue(stages),
                parse.GetValue(drop),
                parse.GetValue(restart)),
            ct));
        return command;
    }
}
