using System.Text.Json;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Output;

namespace DriftWatch.Tests.Output;

public sealed class JsonContractTests
{
    // The field list of the profile JSON as the issue specifies it, in order; the extra fields the
    // record has follow, in the order decided for the contract.
    private static readonly string[] ProfileFields =
    [
        "n_rows", "n_used", "n_null", "n_nonfinite", "n_non_numeric", "x_mean", "x_sd", "y_mean", "y_sd",
        "pearson_r", "pearson_p", "pearson_ci_low", "pearson_ci_high", "spearman_rho", "kendall_tau_b",
        "intercept", "slope", "slope_se", "r_squared", "residual_sd", "quadratic_coef", "quadratic_p",
        "quadratic_r2_gain", "outlier_count", "outlier_rate", "max_cooks_distance", "max_leverage",
        "pearson_r_without_top_influence", "exact_affine", "exact_identity", "exact_monotone", "equation",
        "shape", "shape_reason",
        "distinct_x", "distinct_y", "intercept_se", "cooks_over_threshold",
        "outlier_test_p", "slope_se_robust", "derived_share", "derived_equation",
    ];

    private static JsonElement Serialize(ProfileReport report) =>
        JsonDocument.Parse(JsonContract.Serialize(JsonContract.ToJson(report))).RootElement.Clone();

    private static ProfileReport Report(RelationshipProfile current, RelationshipProfile? baseline = null, params Finding[] findings) =>
        new(current, baseline, findings, new ProfileLabels("x", "y", "current.csv", baseline is null ? null : "baseline.csv"));

    [Fact]
    public void ToJson_Profile_FieldsInContractOrder()
    {
        var json = Serialize(Report(new RelationshipProfile()));

        Assert.Equal(["current", "baseline", "findings", "unmeasurable"], json.EnumerateObject().Select(p => p.Name));
        Assert.Equal(ProfileFields, json.GetProperty("current").EnumerateObject().Select(p => p.Name));
        Assert.Equal(JsonValueKind.Null, json.GetProperty("baseline").ValueKind);
    }

    [Fact]
    public void ToJson_NonFiniteFigures_WrittenAsNull()
    {
        var profile = new RelationshipProfile { PearsonR = double.NaN, Slope = double.PositiveInfinity, XMean = 9 };
        var finding = new Finding(FindingKind.CorrelationShift, Severity.Info, double.NaN, double.NegativeInfinity, "m");

        var text = JsonContract.Serialize(JsonContract.ToJson(Report(profile, profile, finding)));
        var json = JsonDocument.Parse(text).RootElement;

        Assert.DoesNotContain("NaN", text, StringComparison.Ordinal);
        Assert.DoesNotContain("Infinity", text, StringComparison.Ordinal);
        Assert.Equal(JsonValueKind.Null, json.GetProperty("current").GetProperty("pearson_r").ValueKind);
        Assert.Equal(JsonValueKind.Null, json.GetProperty("baseline").GetProperty("slope").ValueKind);
        Assert.Equal(9, json.GetProperty("current").GetProperty("x_mean").GetDouble());
        Assert.Equal(JsonValueKind.Null, json.GetProperty("findings")[0].GetProperty("p_value").ValueKind);
        Assert.Equal(JsonValueKind.Null, json.GetProperty("findings")[0].GetProperty("effect").ValueKind);
    }

    [Fact]
    public void ToJson_Enums_SnakeCaseStrings()
    {
        var profile = new RelationshipProfile { Shape = Shape.Linear };
        var finding = new Finding(FindingKind.BecamePerfect, Severity.Warning, 0.001, 0.25, "y became an exact function of x");

        var json = Serialize(Report(profile, null, finding));

        Assert.Equal("linear", json.GetProperty("current").GetProperty("shape").GetString());
        var f = json.GetProperty("findings")[0];
        Assert.Equal(["kind", "severity", "p_value", "effect", "message"], f.EnumerateObject().Select(p => p.Name));
        Assert.Equal("became_perfect", f.GetProperty("kind").GetString());
        Assert.Equal("warning", f.GetProperty("severity").GetString());
        Assert.Equal(0.001, f.GetProperty("p_value").GetDouble());
        Assert.Equal(0.25, f.GetProperty("effect").GetDouble());
    }

    [Fact]
    public void ToJson_Profile_CarriesEveryFigureOfTheProfile()
    {
        // The JSON is hand-kept beside the record: a figure added to RelationshipProfile and not to the JSON
        // would silently be missing from every outward surface (as outlier_test_p once was).
        var figures = typeof(RelationshipProfile).GetProperties(System.Reflection.BindingFlags.Public | System.Reflection.BindingFlags.Instance)
            .Where(p => p.Name != "EqualityContract")
            .Select(p => JsonNamingPolicy.SnakeCaseLower.ConvertName(p.Name));

        Assert.Equal(figures.Order(StringComparer.Ordinal), ProfileFields.Order(StringComparer.Ordinal));
    }

    [Fact]
    public void ToJson_Profile_LateFiguresCarryTheirValues()
    {
        var profile = new RelationshipProfile { OutlierTestP = 0.0125, SlopeSeRobust = 0.5, DerivedShare = 0.75, DerivedEquation = "y = 2·x" };

        var current = Serialize(Report(profile)).GetProperty("current");

        Assert.Equal(0.0125, current.GetProperty("outlier_test_p").GetDouble());
        Assert.Equal(0.5, current.GetProperty("slope_se_robust").GetDouble());
        Assert.Equal(0.75, current.GetProperty("derived_share").GetDouble());
        Assert.Equal("y = 2·x", current.GetProperty("derived_equation").GetString());
    }

    [Theory]
    [InlineData(FindingKind.SinglePointLeverage, "single_point_leverage")]
    [InlineData(FindingKind.ExactnessLost, "exactness_lost")]
    [InlineData(FindingKind.CheckFailing, "check_failing")]
    public void Name_FindingKind_SnakeCase(FindingKind kind, string expected) =>
        Assert.Equal(expected, JsonContract.Name(kind));
}
