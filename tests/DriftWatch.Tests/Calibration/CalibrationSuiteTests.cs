using DriftWatch.Calibration.Faults;
using DriftWatch.Calibration.Reporting;
using DriftWatch.Calibration.Running;
using DriftWatch.Core.Findings;
using MathNet.Numerics.Distributions;
using Xunit.Abstractions;

namespace DriftWatch.Tests.Calibration;

/// <summary>
/// The quick preset of the calibration suite (3 healthy pairs per family, every fault type at its main size,
/// 5 baseline + 5 monitored days) through the production check path, asserted against the product requirement
/// of issue 9 ("The bar"): at most 0.5 warning-or-worse findings and 0.1 confirmed alerts per 1,000 healthy
/// pair-checks, no healthy check unmeasured, at least 95 % of faults alerted within 2 checks (unit changes
/// critical and named). The full run is the benchmarks' <c>calibrate</c> command.
/// </summary>
/// <remarks>
/// A few hundred checks cannot show a rate of 0.5 per 1,000 directly, so each rate is allowed the count that an
/// engine exactly at the bar would exceed with probability below 0.1 %: the 99.9 % quantile of a Poisson count
/// (findings, alerts) or of a binomial count of misses (detection). That margin is sampling error only, never
/// slack for a worse engine (the quantile of a Poisson or binomial count as a one-sided bound is common practice;
/// distributions from MathNet.Numerics). Category "Calibration": `--filter "Category!=Calibration"` leaves it out.
/// </remarks>
[Trait("Category", "Calibration")]
public sealed class CalibrationSuiteTests(QuickCalibrationFixture fixture, ITestOutputHelper output) : IClassFixture<QuickCalibrationFixture>
{
    private const double Confidence = 0.999;

    private CalibrationResults Results => fixture.Run.Results;

    [Fact]
    public void QuickRun_ChecksEveryHealthyPairOnEveryMonitoredDay()
    {
        output.WriteLine(fixture.Run.Report);

        // The harness itself: 12 families × 3 pairs × 5 monitored days, each a stored run (read back from the store).
        var options = CalibrationOptions.QuickPreset;
        Assert.Equal(12 * options.PairsPerFamily, Results.Healthy.Pairs);
        Assert.Equal(Results.Healthy.Pairs * options.MonitoredDays, Results.Healthy.Checks);
        Assert.Equal(FaultCatalog.Quick().Count, Results.Faults.Count);
    }

    [Fact]
    public void HealthyPairs_WarningOrWorseFindings_WithinTheBar()
    {
        // Issue 9, "The bar": at most 0.5 warning-or-worse findings per 1,000 healthy pair-checks.
        var h = Results.Healthy;
        var allowed = PoissonBound(CalibrationReport.BarFindingsPerThousand / 1000 * h.Checks);
        output.WriteLine($"{h.Findings} warning-or-worse findings in {h.Checks} healthy checks ({h.FindingsPerThousand:0.00} per 1,000); allowed {allowed}");
        output.WriteLine(string.Join(", ", h.ByKind.Select(k => $"{k.Kind} {k.Findings}")));
        Assert.True(h.Findings <= allowed, $"{h.Findings} warning-or-worse findings in {h.Checks} healthy pair-checks ({h.FindingsPerThousand:0.00} per 1,000); the bar allows {allowed}");
    }

    [Fact]
    public void HealthyPairs_ConfirmedAlerts_WithinTheBar()
    {
        // Issue 9, "The bar": at most 0.1 confirmed alerts per 1,000 healthy pair-checks.
        var h = Results.Healthy;
        var allowed = PoissonBound(CalibrationReport.BarConfirmedPerThousand / 1000 * h.Checks);
        output.WriteLine($"{h.Confirmed} confirmed alerts in {h.Checks} healthy checks ({h.ConfirmedPerThousand:0.00} per 1,000); allowed {allowed}");
        Assert.True(h.Confirmed <= allowed, $"{h.Confirmed} alerts of healthy pairs confirmed in {h.Checks} pair-checks ({h.ConfirmedPerThousand:0.00} per 1,000); the bar allows {allowed}");
    }

    [Fact]
    public void HealthyPairs_EveryCheckMeasures()
    {
        // Issue 9: healthy data is always measurable; a failed or unmeasurable check of it is a defect.
        var h = Results.Healthy;
        Assert.True(h.UnmeasuredBaseline + h.UnmeasuredMonitored == 0, string.Join("; ", h.UnmeasuredSamples));
    }

    [Fact]
    public void Faults_AlertedWithinTwoChecks_AtLeastTheBarShare()
    {
        // Issue 9, "The bar": at least 95 % of these faults reach an alert within 2 checks; unit changes critical and named.
        var faults = Results.Faults;
        var misses = faults.Where(f => !f.MeetsBar).ToArray();
        var allowed = BinomialBound(1 - CalibrationReport.BarDetectionShare, faults.Count);
        output.WriteLine($"{faults.Count - misses.Length} of {faults.Count} faults met the bar; misses allowed {allowed}");
        Assert.True(
            misses.Length <= allowed,
            $"{misses.Length} of {faults.Count} faults missed (allowed {allowed}): {string.Join("; ", misses.Select(m => $"{m.Fault.Label} on {m.Host}: {string.Join(", ", m.FirstFindings)}"))}");
    }

    [Fact]
    public void CopyOfXIntoY_ConfirmsBecamePerfect_Critical()
    {
        // Issue 9: a copy of all rows must reach an alert within 2 checks; became_perfect is the kind that names it.
        var copy = Fault(FaultType.CopyXIntoY);
        Assert.True(copy.Caught && copy.AlertKinds.Contains("became_perfect"), Describe(copy));
        Assert.Equal(Severity.Critical, copy.Severity);
    }

    [Fact]
    public void UnitChangeTimes1000_ConfirmsSlopeShift_CriticalAndNamingTheFactor()
    {
        // Issue 9: unit changes (1000 among them) are alerted critical and named within 2 checks.
        var unit = Results.Faults.Single(f => f.Fault is { Type: FaultType.UnitChange, Size: 1000, Column: FaultColumn.Y });
        Assert.True(unit.Caught && unit.AlertKinds.Contains("slope_shift"), Describe(unit));
        Assert.True(unit.UnitCritical == true, Describe(unit));
        Assert.True(unit.UnitNamed == true, Describe(unit));
    }

    [Fact]
    public void RowsCutTo20Percent_ConfirmsSampleShrank()
    {
        // Issue 9: rows cut to half or less reach an alert within 2 checks.
        var cut = Results.Faults.Single(f => f.Fault is { Type: FaultType.RowsCut, Size: 0.2 });
        Assert.True(cut.Caught && cut.AlertKinds.Contains("sample_shrank"), Describe(cut));
    }

    [Fact]
    public void NullsIn30PercentOfRows_ConfirmsNullSurge()
    {
        // Issue 9: nulls in 10 % of rows or more reach an alert within 2 checks.
        var nulls = Results.Faults.Single(f => f.Fault is { Type: FaultType.Nulls, Size: 0.3 });
        Assert.True(nulls.Caught && nulls.AlertKinds.Contains("null_surge"), Describe(nulls));
    }

    private FaultOutcome Fault(FaultType type) => Results.Faults.Single(f => f.Fault.Type == type);

    private static string Describe(FaultOutcome f) =>
        $"{f.Fault.Label} on {f.Host} ({f.Rows} rows): caught {f.Caught}, alerts [{string.Join(", ", f.AlertKinds)}], severity {f.Severity}, " +
        $"unit critical {f.UnitCritical}, named {f.UnitNamed}; first findings: {string.Join(", ", f.FirstFindings)}";

    /// <summary>The count of misses a Binomial(n, p) variable stays at or below with probability <see cref="Confidence"/>.</summary>
    private static int BinomialBound(double p, int n)
    {
        var k = 0;
        while (k < n && Binomial.CDF(p, n, k) < Confidence)
        {
            k++;
        }

        return k;
    }

    /// <summary>The count a Poisson(mean) variable stays at or below with probability <see cref="Confidence"/>.</summary>
    private static int PoissonBound(double mean)
    {
        var k = 0;
        while (Poisson.CDF(mean, k) < Confidence)
        {
            k++;
        }

        return k;
    }
}
