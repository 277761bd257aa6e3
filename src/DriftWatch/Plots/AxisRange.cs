namespace DriftWatch.Plots;

/// <summary>One axis of a picture: the range drawn.</summary>
internal sealed record AxisRange(double Min, double Max)
{
    public double Span => Max - Min;

    public bool Contains(double value) => value >= Min && value <= Max;
}
