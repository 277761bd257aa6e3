using DriftWatch.Core.History;

namespace DriftWatch.Monitoring;

/// <summary>
/// In-process counters for the /metrics endpoint: runs and failures per pair, and a histogram of check
/// durations. Process-lifetime values, as OpenMetrics counters are meant to be (a scraper handles resets).
/// </summary>
internal sealed class CheckMetrics
{
    /// <summary>Histogram upper bounds in seconds (a check is a couple of queries: milliseconds to minutes).</summary>
    public static readonly double[] DurationBuckets = [0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60, 120];

    private readonly Lock _gate = new();
    private readonly Dictionary<string, (long Runs, long Failures)> _perPair = new(StringComparer.Ordinal);
    private readonly long[] _bucketCounts = new long[DurationBuckets.Length];
    private long _durationCount;
    private double _durationSum;

    public void Record(PairCheckResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var seconds = Math.Max(0, result.Elapsed.TotalSeconds);
        lock (_gate)
        {
            var (runs, failures) = _perPair.GetValueOrDefault(result.Pair.Name);
            _perPair[result.Pair.Name] = (runs + 1, failures + (result.Status == RunStatus.Failed ? 1 : 0));
            for (var i = 0; i < DurationBuckets.Length; i++)
            {
                if (seconds <= DurationBuckets[i])
                {
                    _bucketCounts[i]++;
                }
            }

            _durationCount++;
            _durationSum += seconds;
        }
    }

    public MetricsSnapshot Snapshot()
    {
        lock (_gate)
        {
            return new MetricsSnapshot(
                _perPair.OrderBy(p => p.Key, StringComparer.Ordinal).Select(p => new PairCounters(p.Key, p.Value.Runs, p.Value.Failures)).ToList(),
                [.. _bucketCounts],
                _durationCount,
                _durationSum);
        }
    }
}

internal sealed record PairCounters(string Pair, long Runs, long Failures);

/// <param name="BucketCounts">Cumulative counts, one per <see cref="CheckMetrics.DurationBuckets"/> bound.</param>
internal sealed record MetricsSnapshot(IReadOnlyList<PairCounters> Pairs, IReadOnlyList<long> BucketCounts, long DurationCount, double DurationSum);
