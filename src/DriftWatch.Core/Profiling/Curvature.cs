using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Profiling;

/// <summary>Whether a profile found curvature: the rule that names a shape "curved", for the pictures that draw the parabola.</summary>
public static class Curvature
{
    public static bool Found(RelationshipProfile profile, Thresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(thresholds);
        return ShapeRules.IsCurved(profile, thresholds);
    }
}
