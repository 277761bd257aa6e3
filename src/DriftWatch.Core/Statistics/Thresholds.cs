namespace DriftWatch.Core.Statistics;

/// <summary>
/// Every threshold the profile and the comparison use. Defaults are named constants, written again
/// in docs/statistics.md with their references; a pair's YAML <c>thresholds:</c> overrides any of them.
/// </summary>
public sealed record Thresholds
{
    public const double DefaultAlpha = 0.01;
    public const double DefaultOutlierT = 3.0;
    public const double DefaultExactRelativeTolerance = 1e-9;
    public const double DefaultMinCorrelationChange = 0.1;
    public const double DefaultMinSlopeRatioChange = 0.1;
    public const double DefaultUnitFactorTolerance = 0.02;
    public const double DefaultUnitFactorMaxTolerance = 0.08;
    public const double DefaultCurvatureMinR2Gain = 0.02;
    public const double DefaultMinOutlierRateIncrease = 0.005;
    public const double DefaultMaxOutlierRate = 0.01;
    public const double DefaultLeverageCooksDistance = 1.0;
    public const double DefaultMinNullRateIncrease = 0.05;
    public const double DefaultSampleShrinkRatio = 0.5;
    public const double DefaultNoRelationshipR = 0.2;
    public const double DefaultMinOffsetShiftSds = 0.5;
    public const double DefaultLeverageHat = 0.5;
    public const double DefaultStrongRelationshipR = 0.5;
    public const double DefaultMinKsStatistic = 0.1;
    public const double DefaultMinDerivedShare = 0.2;
    public const double DefaultCriticalLeverageHat = 0.9;
    public const int DefaultMinUsableRows = 10;

    /// <summary>Significance level for every hypothesis test in a comparison.</summary>
    public double Alpha { get; init; } = DefaultAlpha;

    /// <summary>|externally studentized residual| above this marks an outlier.</summary>
    public double OutlierT { get; init; } = DefaultOutlierT;

    /// <summary>Residuals within this fraction of y's scale count as zero (exact relationship).</summary>
    public double ExactRelativeTolerance { get; init; } = DefaultExactRelativeTolerance;

    /// <summary>Minimum |Δr| for a correlation shift, so huge samples do not alert on trivia.</summary>
    public double MinCorrelationChange { get; init; } = DefaultMinCorrelationChange;

    /// <summary>Minimum |slope ratio − 1| for a slope shift.</summary>
    public double MinSlopeRatioChange { get; init; } = DefaultMinSlopeRatioChange;

    /// <summary>
    /// Relative distance within which a slope ratio "is" a common unit factor, at the least: a ratio measured less
    /// precisely (the baseline runs' spread, a small sample) matches within its own prediction interval.
    /// </summary>
    public double UnitFactorTolerance { get; init; } = DefaultUnitFactorTolerance;

    /// <summary>
    /// The widest relative distance at which a slope ratio is still named a unit factor, however imprecise the
    /// ratio: a 30 % change of a formula must not be read as miles for kilometres.
    /// </summary>
    public double UnitFactorMaxTolerance { get; init; } = DefaultUnitFactorMaxTolerance;

    /// <summary>Minimum R² gain of the quadratic over the line before curvature is reported.</summary>
    public double CurvatureMinR2Gain { get; init; } = DefaultCurvatureMinR2Gain;

    /// <summary>Minimum outlier-rate increase (absolute) for an outlier surge.</summary>
    public double MinOutlierRateIncrease { get; init; } = DefaultMinOutlierRateIncrease;

    /// <summary>Outlier rate above which a single profile reports outliers.</summary>
    public double MaxOutlierRate { get; init; } = DefaultMaxOutlierRate;

    /// <summary>Cook's distance above which one point alone sets the line.</summary>
    public double LeverageCooksDistance { get; init; } = DefaultLeverageCooksDistance;

    /// <summary>Minimum null-rate increase (absolute) for a null surge.</summary>
    public double MinNullRateIncrease { get; init; } = DefaultMinNullRateIncrease;

    /// <summary>Current usable rows below this fraction of the baseline's is a shrunken sample.</summary>
    public double SampleShrinkRatio { get; init; } = DefaultSampleShrinkRatio;

    /// <summary>|r| and |ρ| both below this: no relationship.</summary>
    public double NoRelationshipR { get; init; } = DefaultNoRelationshipR;

    /// <summary>Minimum intercept move, in baseline residual SDs, for an offset shift.</summary>
    public double MinOffsetShiftSds { get; init; } = DefaultMinOffsetShiftSds;

    /// <summary>
    /// Hat value above which one row alone largely sets the line (Huber 1981: above 0.5 is "dangerous");
    /// the cut is raised to 3p/n for samples so small that every row has a large hat value.
    /// </summary>
    public double LeverageHat { get; init; } = DefaultLeverageHat;

    /// <summary>Baseline |r| at least this counts as a strong relationship that can be lost (Cohen 1988: "large").</summary>
    public double StrongRelationshipR { get; init; } = DefaultStrongRelationshipR;

    /// <summary>Minimum Kolmogorov–Smirnov distance D for a marginal shift, so huge samples do not alert on trivia.</summary>
    public double MinKsStatistic { get; init; } = DefaultMinKsStatistic;

    /// <summary>
    /// <c>partly_derived</c>: the share of rows lying exactly on one line must have risen by at least this over the
    /// baseline runs' (absolute), and be at least this now.
    /// </summary>
    public double MinDerivedShare { get; init; } = DefaultMinDerivedShare;
    /// Fewer usable rows than this and the check cannot measure the relationship (its run is unmeasurable, not
    /// "ok"): Pearson's test has n − 2 degrees of freedom, and with a handful of rows every figure is noise.
    /// </summary>
    public int MinUsableRows { get; init; } = DefaultMinUsableRows;

    /// <summary>
    /// <c>leverage_appeared</c> is critical when the new row's hat value is at least this and the row alone moves r
    /// by <see cref="MinCorrelationChange"/>: a row nearly alone in setting the line (a total row among detail rows
    /// has h close to 1), not a large but ordinary value of a skewed column, which stays a warning.
    /// </summary>
    public double CriticalLeverageHat { get; init; } = DefaultCriticalLeverageHat;

    public static Thresholds Default { get; } = new();
}
