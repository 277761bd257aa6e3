using System.Text.Encodings.Web;
using System.Text.Json;
using System.Text.Json.Serialization;
using System.Text.Unicode;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Output;

/// <summary>
/// The one JSON shape of profiles and findings that every outward surface shares (<c>profile</c>,
/// <c>check</c>, <c>history</c>, the dashboard API): snake_case names, snake_case enum strings, null for
/// an undefined figure and never NaN or infinity. A run's <c>status</c> is <see cref="Name{T}"/> of its
/// <see cref="Core.History.RunStatus"/>: "succeeded", "failed", "unmeasurable" or "interrupted", the last three with the reason in
/// <c>error</c>; <c>profile</c> says "unmeasurable" (the reason, or null) for its current extract.
/// </summary>
internal static class JsonContract
{
    /// <summary>
    /// Options for the contract. Number handling stays strict, so a non-finite double that slipped past
    /// the mapping below would throw rather than print NaN.
    /// </summary>
    public static JsonSerializerOptions Options { get; } = CreateOptions(indented: true);

    /// <summary>The same, on one line (history rows, API responses).</summary>
    public static JsonSerializerOptions CompactOptions { get; } = CreateOptions(indented: false);

    public static ProfileJson ToJson(RelationshipProfile profile)
    {
        ArgumentNullException.ThrowIfNull(profile);
        return new ProfileJson(
            profile.NRows,
            profile.NUsed,
            profile.NNull,
            profile.NNonfinite,
            profile.NNonNumeric,
            Finite(profile.XMean),
            Finite(profile.XSd),
            Finite(profile.YMean),
            Finite(profile.YSd),
            Finite(profile.PearsonR),
            Finite(profile.PearsonP),
            Finite(profile.PearsonCiLow),
            Finite(profile.PearsonCiHigh),
            Finite(profile.SpearmanRho),
            Finite(profile.KendallTauB),
            Finite(profile.Intercept),
            Finite(profile.Slope),
            Finite(profile.SlopeSe),
            Finite(profile.RSquared),
            Finite(profile.ResidualSd),
            Finite(profile.QuadraticCoef),
            Finite(profile.QuadraticP),
            Finite(profile.QuadraticR2Gain),
            profile.OutlierCount,
            Finite(profile.OutlierRate),
            Finite(profile.MaxCooksDistance),
            Finite(profile.MaxLeverage),
            Finite(profile.PearsonRWithoutTopInfluence),
            profile.ExactAffine,
            profile.ExactIdentity,
            profile.ExactMonotone,
            profile.Equation,
            profile.Shape,
            profile.ShapeReason,
            profile.DistinctX,
            profile.DistinctY,
            Finite(profile.InterceptSe),
            profile.CooksOverThreshold,
            Finite(profile.OutlierTestP),
            Finite(profile.SlopeSeRobust),
            Finite(profile.DerivedShare),
            profile.DerivedEquation);
    }

    public static FindingJson ToJson(Finding finding)
    {
        ArgumentNullException.ThrowIfNull(finding);
        return new FindingJson(finding.Kind, finding.Severity, Finite(finding.PValue), Finite(finding.Effect), finding.Message);
    }

    public static ProfileReportJson ToJson(ProfileReport report)
    {
        ArgumentNullException.ThrowIfNull(report);
        return new ProfileReportJson(
            ToJson(report.Current),
            report.Baseline is null ? null : ToJson(report.Baseline),
            [.. report.Findings.Select(ToJson)],
            report.Unmeasurable);
    }

    public static string Serialize<T>(T value) => JsonSerializer.Serialize(value, Options);

    /// <summary>An enum value as the contract spells it: <c>BecamePerfect</c> is "became_perfect".</summary>
    public static string Name<T>(T value)
        where T : struct, Enum => JsonNamingPolicy.SnakeCaseLower.ConvertName(value.ToString());

    // The engine promises finite-or-null; the contract enforces it once more at the boundary.
    internal static double? Finite(double? value) => value is { } v && double.IsFinite(v) ? v : null;

    private static JsonSerializerOptions CreateOptions(bool indented)
    {
        var options = new JsonSerializerOptions
        {
            WriteIndented = indented,
            NewLine = "\n",
            PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
            NumberHandling = JsonNumberHandling.Strict,
            // Column names and equations ("y = 118·x") stay readable; HTML-sensitive characters are
            // still escaped, so the same text is safe inside the dashboard's pages.
            Encoder = JavaScriptEncoder.Create(UnicodeRanges.All),
            DefaultIgnoreCondition = JsonIgnoreCondition.Never,
            Converters = { new JsonStringEnumConverter(JsonNamingPolicy.SnakeCaseLower, allowIntegerValues: false) },
        };
        options.MakeReadOnly(populateMissingResolver: true);
        return options;
    }
}
