namespace DriftWatch.Core.Profiling;

/// <summary>Accumulates rows one at a time (sources stream rows; a CSV reader also reports unreadable cells).</summary>
public sealed class PairedSampleBuilder
{
    private readonly List<double> _x;
    private readonly List<double> _y;
    private int _null;
    private int _nonFinite;
    private int _nonNumeric;

    public PairedSampleBuilder(int capacity = 0)
    {
        _x = new List<double>(capacity);
        _y = new List<double>(capacity);
    }

    public int Count => _x.Count;

    public void Add(double? x, double? y)
    {
        if (x is null || y is null)
        {
            _null++;
        }
        else if (!double.IsFinite(x.Value) || !double.IsFinite(y.Value))
        {
            _nonFinite++;
        }
        else
        {
            _x.Add(x.Value);
            _y.Add(y.Value);
        }
    }

    /// <summary>Counts a row whose x or y cell held text that is not a number.</summary>
    public void AddNonNumeric() => _nonNumeric++;

    public PairedSample Build() => new([.. _x], [.. _y], _null, _nonFinite, _nonNumeric);
}
