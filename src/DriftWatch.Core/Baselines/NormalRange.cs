namespace DriftWatch.Core.Baselines;

/// <summary>
/// The range of a figure the baseline's runs make plausible for one new run: the centre (mean of the runs) and
/// the two-sided (1 − alpha) prediction interval around it, in the figure's own units.
/// </summary>
public sealed record NormalRange(double Centre, double Low, double High)
{
    public bool Contains(double value) => value >= Low && value <= High;
}
