using DriftWatch.Core.Statistics;

namespace DriftWatch.Configuration;

/// <summary>
/// <c>thresholds:</c> one snake_case key per member of <see cref="Thresholds"/>, each with the range that makes
/// sense for it. Read over a starting set, so a pair's keys merge one by one over the defaults'.
/// A test checks that the table covers every member and that each key sets its own member.
/// </summary>
internal static class ThresholdsSection
{
    private static readonly NumberRange CorrelationSpan = new(0, true, 2, true);

    internal static readonly (string Key, NumberRange Range, Func<Thresholds, double, Thresholds> Set)[] Entries =
    [
        ("alpha", NumberRange.OpenUnit, (t, v) => t with { Alpha = v }),
        ("outlier_t", NumberRange.Positive, (t, v) => t with { OutlierT = v }),
        ("exact_relative_tolerance", new NumberRange(0, true, 1, false), (t, v) => t with { ExactRelativeTolerance = v }),
        ("min_correlation_change", CorrelationSpan, (t, v) => t with { MinCorrelationChange = v }),
        ("min_slope_ratio_change", NumberRange.NonNegative, (t, v) => t with { MinSlopeRatioChange = v }),
        ("unit_factor_tolerance", new NumberRange(0, true, 1, false), (t, v) => t with { UnitFactorTolerance = v }),
        ("min_derived_share", NumberRange.Fraction, (t, v) => t with { MinDerivedShare = v }),
        ("critical_leverage_hat", NumberRange.Fraction, (t, v) => t with { CriticalLeverageHat = v }),
        ("unit_factor_max_tolerance", new NumberRange(0, true, 1, false), (t, v) => t with { UnitFactorMaxTolerance = v }),
        ("curvature_min_r2_gain", NumberRange.Fraction, (t, v) => t with { CurvatureMinR2Gain = v }),
        ("min_outlier_rate_increase", NumberRange.Fraction, (t, v) => t with { MinOutlierRateIncrease = v }),
        ("max_outlier_rate", NumberRange.Fraction, (t, v) => t with { MaxOutlierRate = v }),
        ("leverage_cooks_distance", NumberRange.Positive, (t, v) => t with { LeverageCooksDistance = v }),
        ("min_null_rate_increase", NumberRange.Fraction, (t, v) => t with { MinNullRateIncrease = v }),
        ("sample_shrink_ratio", NumberRange.Fraction, (t, v) => t with { SampleShrinkRatio = v }),
        ("no_relationship_r", NumberRange.Fraction, (t, v) => t with { NoRelationshipR = v }),
        ("min_offset_shift_sds", NumberRange.NonNegative, (t, v) => t with { MinOffsetShiftSds = v }),
        ("leverage_hat", new NumberRange(0, true, 1, true), (t, v) => t with { LeverageHat = v }),
        ("strong_relationship_r", NumberRange.Fraction, (t, v) => t with { StrongRelationshipR = v }),
        ("min_ks_statistic", NumberRange.Fraction, (t, v) => t with { MinKsStatistic = v }),
    ];

    /// <summary>The whole-number thresholds (row counts), read as integers so "10.5 rows" is refused.</summary>
    internal static readonly (string Key, int Min, int Max, Func<Thresholds, int, Thresholds> Set)[] CountEntries =
    [
        // At least 3: below that a correlation test has no degrees of freedom. The upper bound only catches typos.
        ("min_usable_rows", MinUsableRowsFloor, MinUsableRowsCeiling, (t, v) => t with { MinUsableRows = v }),
    ];

    internal const int MinUsableRowsFloor = 3;
    internal const int MinUsableRowsCeiling = 1_000_000;

    public static IEnumerable<string> Keys => Entries.Select(e => e.Key).Concat(CountEntries.Select(e => e.Key));

    public static Thresholds Read(MappingReader? reader, Thresholds start)
    {
        if (reader is null)
        {
            return start;
        }

        var result = start;
        foreach (var (key, range, set) in Entries)
        {
            if (reader.Double(key, range) is { } value)
            {
                result = set(result, value);
            }
        }

        foreach (var (key, min, max, set) in CountEntries)
        {
            if (reader.Int(key, min, max) is { } value)
            {
                result = set(result, value);
            }
        }

        reader.Done();
        return result;
    }
}
