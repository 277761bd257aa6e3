namespace DriftWatch.Core.Profiling;

/// <summary>What a scatter plot of the pair looks like, in one word. Serialised in snake_case.</summary>
public enum Shape
{
    /// <summary>Fewer than 3 usable rows or zero variance; see the profile's shape reason.</summary>
    Undefined,

    /// <summary>No detectable relationship.</summary>
    None,

    /// <summary>A straight-line cloud.</summary>
    Linear,

    /// <summary>A smooth curve: the quadratic term is significant and adds explained variance.</summary>
    Curved,

    /// <summary>A line with one or more points far off it.</summary>
    Outlier,

    /// <summary>One point alone sets the fitted line.</summary>
    Leverage,

    /// <summary>y is an exact affine function of x.</summary>
    Perfect,

    /// <summary>y is an exact monotone, non-linear function of x.</summary>
    Monotone,
}
