using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.Baselines;

/// <summary>
/// A uniform random sample of at most <see cref="Capacity"/> points from a stream of unknown length
/// (reservoir sampling, Algorithm R). Seeded, so the same stream in the same order gives the same sample.
/// </summary>
/// <remarks>
/// Written here because MathNet.Numerics has no reservoir sampler; System.Random with a seed is
/// deterministic across runs and platforms.
/// </remarks>
public sealed class PointReservoir
{
    private readonly double[] _x;
    private readonly double[] _y;
    private readonly Random _random;
    private long _seen;

    public PointReservoir(int capacity, int seed)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(capacity, 1);
        Capacity = capacity;
        _x = new double[capacity];
        _y = new double[capacity];
        _random = new Random(seed);
    }

    public int Capacity { get; }

    /// <summary>How many points were offered so far.</summary>
    public long Seen => _seen;

    public int Count => (int)Math.Min(_seen, Capacity);

    public void Add(double x, double y)
    {
        if (_seen < Capacity)
        {
            _x[_seen] = x;
            _y[_seen] = y;
        }
        else
        {
            // Keep the new point with probability Capacity / (seen + 1), replacing a uniformly chosen one.
            var j = _random.NextInt64(_seen + 1);
            if (j < Capacity)
            {
                _x[j] = x;
                _y[j] = y;
            }
        }

        _seen++;
    }

    public void AddRange(PairedSample sample)
    {
        ArgumentNullException.ThrowIfNull(sample);
        for (var i = 0; i < sample.UsedCount; i++)
        {
            Add(sample.X[i], sample.Y[i]);
        }
    }

    /// <summary>The kept points, in reservoir order, with the given drop counts attached.</summary>
    public PairedSample ToSample(int nullCount = 0, int nonFiniteCount = 0, int nonNumericCount = 0) =>
        new(_x[..Count], _y[..Count], nullCount, nonFiniteCount, nonNumericCount);
}
