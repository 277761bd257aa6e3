using System.Text.Json.Serialization;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Output;

/// <summary>
/// One profile as the outward JSON contract shows it, the only hand-kept JSON form of
/// <see cref="RelationshipProfile"/> (the store serialises the record itself). The names and their order are pinned by an
/// approval test (tests/DriftWatch.Tests/Data/expected/profile_anscombe1.json): add fields at the end,
/// never rename or reorder. Every double is finite or null.
/// </summary>
internal sealed record ProfileJson(
    [property: JsonPropertyName("n_rows")] int NRows,
    [property: JsonPropertyName("n_used")] int NUsed,
    [property: JsonPropertyName("n_null")] int NNull,
    [property: JsonPropertyName("n_nonfinite")] int NNonfinite,
    [property: JsonPropertyName("n_non_numeric")] int NNonNumeric,
    [property: JsonPropertyName("x_mean")] double? XMean,
    [property: JsonPropertyName("x_sd")] double? XSd,
    [property: JsonPropertyName("y_mean")] double? YMean,
    [property: JsonPropertyName("y_sd")] double? YSd,
    [property: JsonPropertyName("pearson_r")] double? PearsonR,
    [property: JsonPropertyName("pearson_p")] double? PearsonP,
    [property: JsonPropertyName("pearson_ci_low")] double? PearsonCiLow,
    [property: JsonPropertyName("pearson_ci_high")] double? PearsonCiHigh,
    [property: JsonPropertyName("spearman_rho")] double? SpearmanRho,
    [property: JsonPropertyName("kendall_tau_b")] double? KendallTauB,
    [property: JsonPropertyName("intercept")] double? Intercept,
    [property: JsonPropertyName("slope")] double? Slope,
    [property: JsonPropertyName("slope_se")] double? SlopeSe,
    [property: JsonPropertyName("r_squared")] double? RSquared,
    [property: JsonPropertyName("residual_sd")] double? ResidualSd,
    [property: JsonPropertyName("quadratic_coef")] double? QuadraticCoef,
    [property: JsonPropertyName("quadratic_p")] double? QuadraticP,
    [property: JsonPropertyName("quadratic_r2_gain")] double? QuadraticR2Gain,
    [property: JsonPropertyName("outlier_count")] int? OutlierCount,
    [property: JsonPropertyName("outlier_rate")] double? OutlierRate,
    [property: JsonPropertyName("max_cooks_distance")] double? MaxCooksDistance,
    [property: JsonPropertyName("max_leverage")] double? MaxLeverage,
    [property: JsonPropertyName("pearson_r_without_top_influence")] double? PearsonRWithoutTopInfluence,
    [property: JsonPropertyName("exact_affine")] bool ExactAffine,
    [property: JsonPropertyName("exact_identity")] bool ExactIdentity,
    [property: JsonPropertyName("exact_monotone")] bool ExactMonotone,
    [property: JsonPropertyName("equation")] string? Equation,
    [property: JsonPropertyName("shape")] Shape Shape,
    [property: JsonPropertyName("shape_reason")] string? ShapeReason,
    // Beyond the first contract, in the record's order: kept because triage uses them.
    [property: JsonPropertyName("distinct_x")] int DistinctX,
    [property: JsonPropertyName("distinct_y")] int DistinctY,
    [property: JsonPropertyName("intercept_se")] double? InterceptSe,
    [property: JsonPropertyName("cooks_over_threshold")] int? CooksOverThreshold,
    // Every other figure of the profile, so the JSON is the whole profile (a test checks none is left out).
    [property: JsonPropertyName("outlier_test_p")] double? OutlierTestP,
    [property: JsonPropertyName("slope_se_robust")] double? SlopeSeRobust,
    [property: JsonPropertyName("derived_share")] double? DerivedShare,
    [property: JsonPropertyName("derived_equation")] string? DerivedEquation);
