namespace DriftWatch.Core.Profiling;

/// <summary>
/// Everything DriftWatch knows about one extract of a pair. A null figure means "undefined for this
/// sample" (too few rows, zero variance); the engine never emits NaN or infinity.
/// Field names map one-to-one to the snake_case JSON contract of <c>driftwatch profile</c>.
/// </summary>
public sealed record RelationshipProfile
{
    public int NRows { get; init; }
    public int NUsed { get; init; }
    public int NNull { get; init; }
    public int NNonfinite { get; init; }
    public int NNonNumeric { get; init; }
    public int DistinctX { get; init; }
    public int DistinctY { get; init; }
    public double? XMean { get; init; }
    public double? XSd { get; init; }
    public double? YMean { get; init; }
    public double? YSd { get; init; }
    public double? PearsonR { get; init; }
    public double? PearsonP { get; init; }
    public double? PearsonCiLow { get; init; }
    public double? PearsonCiHigh { get; init; }
    public double? SpearmanRho { get; init; }
    public double? KendallTauB { get; init; }
    public double? Intercept { get; init; }
    public double? Slope { get; init; }
    public double? SlopeSe { get; init; }

    /// <summary>Heteroscedasticity-consistent (HC1) standard error of the slope: honest under noise that grows with x or has heavy tails.</summary>
    public double? SlopeSeRobust { get; init; }
    public double? InterceptSe { get; init; }
    public double? RSquared { get; init; }
    public double? ResidualSd { get; init; }
    public double? QuadraticCoef { get; init; }
    public double? QuadraticP { get; init; }
    public double? QuadraticR2Gain { get; init; }
    public int? OutlierCount { get; init; }
    public double? OutlierRate { get; init; }

    /// <summary>
    /// Bonferroni p of the most extreme externally studentized residual: n · P(|t(n − 3)| ≥ max |tᵢ|),
    /// capped at 1 (the outlier test of Cook and Weisberg 1982). Small means at least one row is an
    /// outlier beyond what normal errors produce in a sample of this size.
    /// </summary>
    public double? OutlierTestP { get; init; }
    public double? MaxCooksDistance { get; init; }
    public int? CooksOverThreshold { get; init; }
    public double? MaxLeverage { get; init; }
    public double? PearsonRWithoutTopInfluence { get; init; }
    public bool ExactAffine { get; init; }
    public bool ExactIdentity { get; init; }
    public bool ExactMonotone { get; init; }
    public string? Equation { get; init; }

    /// <summary>
    /// The largest share of rows lying exactly on one straight line (1 for an exact affine pair): rows copied or
    /// derived from the other column. Null when undefined (fewer than 10 rows).
    /// </summary>
    public double? DerivedShare { get; init; }

    /// <summary>That line, as "y = 1.2·x", when any rows lie on it.</summary>
    public string? DerivedEquation { get; init; }
    public Shape Shape { get; init; }
    public string? ShapeReason { get; init; }
}
