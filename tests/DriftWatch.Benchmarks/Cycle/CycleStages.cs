using DriftWatch.Alerting.Evaluation;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Monitoring;
using DriftWatch.Sources;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>
/// Where a cycle's time goes: the steps <see cref="PairChecker"/> takes for each pair, timed one stage at a
/// time over all pairs with the same service objects the cycle used. The source stage runs with the cycle's
/// parallelism (<see cref="MonitorCycle.MaxParallelChecks"/>, bounded by the source's own limit); the others
/// run one pair after another, so their wall time is the CPU and I/O they cost, which the cycle spreads
/// over its concurrent checks. The sum need not equal a cycle: in the cycle the stages overlap.
/// </summary>
internal static class CycleStages
{
    public static async Task RunAsync(IServiceProvider services, DriftWatchConfig config, ServerCpu? server, TextWriter output, CancellationToken ct)
    {
        var sources = services.GetRequiredService<ISourceFactory>();
        var store = services.GetRequiredService<IHistoryStore>();
        var baselines = services.GetRequiredService<BaselineService>();
        var alerts = services.GetRequiredService<AlertEvaluation>();
        var time = services.GetRequiredService<TimeProvider>();
        var pairs = config.Pairs;
        await output.WriteLineAsync($"Stages over {pairs.Count} pairs:");

        var sampled = new SampledPair[pairs.Count];
        var started = new DateTimeOffset[pairs.Count];
        var (_, source) = await CycleMeasurement.MeasureAsync(server, async () =>
        {
            await Parallel.ForEachAsync(
                Enumerable.Range(0, pairs.Count),
                new ParallelOptions { MaxDegreeOfParallelism = MonitorCycle.MaxParallelChecks, CancellationToken = ct },
                async (i, token) =>
                {
                    started[i] = time.GetUtcNow();
                    sampled[i] = await sources.Create(config.FindSource(pairs[i].Source)!).SampleAsync(pairs[i], started[i], token);
                });
            return 0;
        });
        await Report(output, "source (aggregate + sample, parallel)", source);

        var stored = new StoredBaseline?[pairs.Count];
        var (_, baseline) = await CycleMeasurement.MeasureAsync(server, async () =>
        {
            for (var i = 0; i < pairs.Count; i++)
            {
                stored[i] = await baselines.GetOrBuildAsync(pairs[i], started[i], ct);
            }

            return 0;
        });
        await Report(output, "baseline read from the store (serial)", baseline);

        var runs = new NewRun[pairs.Count];
        var (_, engine) = await CycleMeasurement.MeasureAsync(server, () =>
        {
            for (var i = 0; i < pairs.Count; i++)
            {
                var pair = pairs[i];
                var sample = sampled[i].Sample;
                var profile = Profiler.Profile(sample, pair.Thresholds);
                var findings = FindingEngine.Assess(profile, sample, stored[i]?.Profile, stored[i]?.Points, pair.Declared, pair.Thresholds, pair.X, pair.Y);
                runs[i] = new NewRun(pair.Name, started[i], time.GetUtcNow(), RunStatus.Succeeded, null, profile, findings, sampled[i].Figures, sample, sampled[i].Method);
            }

            return Task.FromResult(0);
        });
        await Report(output, "engine: profile + findings (serial)", engine);

        var (_, write) = await CycleMeasurement.MeasureAsync(server, async () =>
        {
            foreach (var run in runs)
            {
                await store.RecordRunAsync(run, ct);
            }

            return 0;
        });
        await Report(output, "store write of the runs (serial)", write);

        var (_, alerting) = await CycleMeasurement.MeasureAsync(server, () => alerts.EvaluateNewRunsAsync(ct));
        await Report(output, "alert evaluation of those runs", alerting);
    }

    private static Task Report(TextWriter output, string stage, CycleMeasurement m) =>
        output.WriteLineAsync($"  {stage,-40} {m.Format()}");
}
