using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.Discovery;

/// <summary>
/// One sample of whole rows of the surveyed columns, column by column: null for a null, NaN or ±infinity as read
/// (NaN also for a value that is not a number). Every pair is profiled on the same rows.
/// </summary>
public sealed class SharedSample
{
    private readonly double?[][] _values;

    /// <param name="values">One array per column, all of the same length.</param>
    public SharedSample(IReadOnlyList<string> columns, double?[][] values, string method)
    {
        ArgumentNullException.ThrowIfNull(columns);
        ArgumentNullException.ThrowIfNull(values);
        if (values.Length != columns.Count || values.Any(v => v.Length != (values.Length == 0 ? 0 : values[0].Length)))
        {
            throw new ArgumentException("A shared sample needs one value array per column, all of one length.", nameof(values));
        }

        Columns = columns;
        _values = values;
        Method = method;
    }

    public IReadOnlyList<string> Columns { get; }

    public int RowCount => _values.Length == 0 ? 0 : _values[0].Length;

    /// <summary>How the rows were drawn ("all 5000", "random 10000", "tablesample system 2.5% 10000").</summary>
    public string Method { get; }

    /// <summary>The pair's rows: nulls and non-finite values counted and dropped as every profile does.</summary>
    public PairedSample Pair(int x, int y)
    {
        var builder = new PairedSampleBuilder(RowCount);
        double?[] xs = _values[x], ys = _values[y];
        for (var k = 0; k < xs.Length; k++)
        {
            builder.Add(xs[k], ys[k]);
        }

        return builder.Build();
    }
}
