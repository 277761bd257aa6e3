using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Serialization;
using DriftWatch.Calibration.Faults;
using DriftWatch.Calibration.Generation;
using DriftWatch.Calibration.Running;
using DriftWatch.Output;

namespace DriftWatch.Calibration.Reporting;

/// <summary>
/// The printed report: what was simulated (families and faults), the rates of healthy pairs against the bar of
/// issue 9, and the detection table. Also the JSON form of the results.
/// </summary>
internal static class CalibrationReport
{
    /// <summary>The product requirement (issue 9, "The bar"): at most 0.5 warning-or-worse findings per 1,000 healthy pair-checks.</summary>
    public const double BarFindingsPerThousand = 0.5;

    /// <summary>Issue 9: at most 0.1 confirmed alerts per 1,000 healthy pair-checks.</summary>
    public const double BarConfirmedPerThousand = 0.1;

    /// <summary>Issue 9: at least 95 % of the faults reach an alert within 2 checks (unit changes critical and named).</summary>
    public const double BarDetectionShare = 0.95;

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private static readonly JsonSerializerOptions JsonOptions = new()
    {
        WriteIndented = true,
        PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
        Converters = { new JsonStringEnumConverter(JsonNamingPolicy.SnakeCaseLower) },
    };

    public static string Text(CalibrationPlan plan, CalibrationResults results)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(results);
        var s = new StringBuilder();
        Header(s, plan, results);
        HealthySection(s, results.Healthy);
        DetectionSection(s, results);
        Summary(s, results);
        return s.ToString();
    }

    public static string Json(CalibrationResults results) => JsonSerializer.Serialize(results, JsonOptions);

    private static void Header(StringBuilder s, CalibrationPlan plan, CalibrationResults r)
    {
        var o = plan.Options;
        s.AppendLine(Inv, $"DriftWatch calibration{(o.Quick ? " (quick preset)" : string.Empty)}, {r.StartedAt:yyyy-MM-dd HH:mm} UTC, {r.Elapsed.TotalSeconds:0} s");
        s.AppendLine(Inv, $"  source         {r.Source}; store SQLite; every setting at its default except table, window and first_runs = baseline days");
        s.AppendLine(Inv, $"  calendar       {o.Days} days from {CalibrationPlan.FirstDate:yyyy-MM-dd} ({CalibrationPlan.FirstDate:dddd}), checked daily at {CalibrationPlan.CheckTimeOfDay:hh\\:mm} UTC; days 1–{o.BaselineDays} baseline, {o.BaselineDays + 1}–{o.Days} monitored; faults from day {o.FaultDay}");
        s.AppendLine(Inv, $"  pairs          {r.Healthy.Pairs} healthy ({o.PairsPerFamily} per family) + {r.Faults.Count} faulty; {r.RowsLoaded:N0} rows loaded; seed {r.Seed}");
        s.AppendLine("  storage        pairs alternate between a table replaced every day (whole table read) and an append-only table read through window {column: loaded_at, last: 24h}");
        s.AppendLine("  every pair     day-to-day variation: slope ±3 %, intercept ±0.15 residual SD, noise SD ±10 %, rows ±30 %");
        s.AppendLine("  Findings are statistical signals, not proof; the data here is invented.");
        s.AppendLine();
        s.AppendLine("Healthy families");
        foreach (var family in HealthyFamilies.All)
        {
            s.AppendLine(Inv, $"  {HealthyFamilies.Name(family),-16} {HealthyFamilies.Describe(family)}");
        }

        s.AppendLine();
        s.AppendLine("Faults (injected into one pair each, host families in turn; the line and residual SD are the day's own least-squares ones)");
        foreach (var type in plan.Faults.Select(f => f.Type).Distinct())
        {
            var cases = plan.Faults.Where(f => f.Type == type).ToArray();
            s.AppendLine(Inv, $"  {Describe(type)}");
            s.AppendLine(Inv, $"      sizes: {string.Join(", ", cases.Select(c => c.Label))}; expected: {string.Join(" | ", cases[0].Expected.Select(k => JsonContract.Name(k)))}");
        }

        s.AppendLine();
    }

    private static string Describe(FaultType type) => type switch
    {
        FaultType.CopyXIntoY => "copy: y := x on every row",
        FaultType.AffineDerivation => "affine derivation: y := a + b·x (the pair's own line) on a share of rows",
        FaultType.UnitChange => "unit change: y or x multiplied by a unit factor (y×f moves the slope by f, x×f by 1/f); must be critical and name the factor",
        FaultType.SlopeChange => "slope change: the line turns about x's mean by the share (y += s·b·(x − mean x))",
        FaultType.Offset => "offset: y += k residual SDs",
        FaultType.KeyMisalignment => "key misalignment: y shuffled among a share of rows",
        FaultType.Sentinel => "sentinel: a share of rows get a placeholder value",
        FaultType.Nulls => "nulls: a share of rows get NULL",
        FaultType.SignFlip => "sign flip: y := −y",
        FaultType.RowsCut => "rows cut: only a share of the day's rows arrive",
        FaultType.Cap => "cap: y := min(y, the day's percentile of y)",
        FaultType.AggregateRow => "aggregate row: one row holding the column totals, loaded among the detail rows of a table of fixed size",
        _ => type.ToString(),
    };

    private static void HealthySection(StringBuilder s, HealthyRates h)
    {
        s.AppendLine(Inv, $"(a, b) Healthy pairs, monitored days: {h.Checks:N0} pair-checks");
        var families = new TextTable("family", ">pairs", ">checks", ">warn+ findings", ">per 1,000", ">confirmed alerts", ">per 1,000", ">unmeasured runs");
        foreach (var f in h.ByFamily)
        {
            families.Add(f.Family, N(f.Pairs), N(f.Checks), N(f.Findings), Rate(f.FindingsPerThousand), N(f.Confirmed), Rate(f.ConfirmedPerThousand), N(f.Unmeasured));
        }

        families.Add("all", N(h.Pairs), N(h.Checks), N(h.Findings), Rate(h.FindingsPerThousand), N(h.Confirmed), Rate(h.ConfirmedPerThousand), N(h.UnmeasuredBaseline + h.UnmeasuredMonitored));
        families.WriteTo(s);
        s.AppendLine();
        if (h.ByKind.Count > 0)
        {
            var kinds = new TextTable("finding kind", ">warn+ findings", ">per 1,000", ">confirmed alerts", ">per 1,000");
            foreach (var k in h.ByKind)
            {
                kinds.Add(k.Kind, N(k.Findings), Rate(HealthyRates.PerThousand(k.Findings, h.Checks)), N(k.Confirmed), Rate(HealthyRates.PerThousand(k.Confirmed, h.Checks)));
            }

            kinds.WriteTo(s);
            s.AppendLine();
        }

        s.AppendLine(Inv, $"(c) Healthy runs that did not measure (failed or unmeasurable): {h.UnmeasuredBaseline} on baseline days, {h.UnmeasuredMonitored} on monitored days (should be 0)");
        foreach (var sample in h.UnmeasuredSamples)
        {
            s.AppendLine(Inv, $"    {sample}");
        }

        s.AppendLine();
    }

    private static void DetectionSection(StringBuilder s, CalibrationResults r)
    {
        s.AppendLine(Inv, $"(d) Detection: fault on day {r.FaultDay} (d); 'caught' = an alert of an expected kind confirmed on day d or d+1");
        var table = new TextTable("fault", "host", "storage", ">rows", "caught", "any alert", "severity", "unit crit/named", "first findings (from day d; @d+1: next day)");
        foreach (var f in r.Faults)
        {
            table.Add(
                f.Fault.Label,
                f.Host,
                f.Storage,
                N(f.Rows),
                f.Caught ? $"yes d{(f.CaughtOnDay == r.FaultDay ? string.Empty : "+1")}" : "NO",
                f.AnyAlert ? string.Join(",", f.AlertKinds) : "-",
                f.Severity is { } sev ? JsonContract.Name(sev) : "-",
                f.Fault.IsUnit ? $"{YesNo(f.UnitCritical)}/{YesNo(f.UnitNamed)}" : string.Empty,
                f.FirstFindings.Count == 0 ? "(none)" : string.Join(", ", f.FirstFindings));
        }

        table.WriteTo(s);
        s.AppendLine();
        var byHost = new TextTable("host family", ">faults", ">caught", ">meets bar", ">any alert");
        foreach (var g in r.Faults.GroupBy(f => f.Host).OrderBy(g => g.Key, StringComparer.Ordinal))
        {
            byHost.Add(g.Key, N(g.Count()), N(g.Count(f => f.Caught)), N(g.Count(f => f.MeetsBar)), N(g.Count(f => f.AnyAlert)));
        }

        byHost.WriteTo(s);
        s.AppendLine();
    }

    private static void Summary(StringBuilder s, CalibrationResults r)
    {
        var h = r.Healthy;
        s.AppendLine("Against the bar (issue 9)");
        s.AppendLine(Inv, $"  warning-or-worse findings per 1,000 healthy pair-checks  {Rate(h.FindingsPerThousand),8}   bar ≤ {BarFindingsPerThousand}");
        s.AppendLine(Inv, $"  confirmed alerts per 1,000 healthy pair-checks           {Rate(h.ConfirmedPerThousand),8}   bar ≤ {BarConfirmedPerThousand}");
        s.AppendLine(Inv, $"  healthy runs that did not measure                        {h.UnmeasuredBaseline + h.UnmeasuredMonitored,8}   bar 0");
        s.AppendLine(Inv, $"  faults caught within 2 checks (unit: critical + named)   {Pct(r.ShareMeetingBar),8}   bar ≥ {BarDetectionShare:0%}   ({r.FaultsMeetingBar} of {r.Faults.Count}; expected kind confirmed: {r.FaultsCaught}; any alert: {r.FaultsWithAnyAlert})");
    }

    private static string N(int value) => value.ToString("N0", Inv);

    private static string Rate(double value) => double.IsNaN(value) ? "n/a" : value.ToString("0.00", Inv);

    private static string Pct(double value) => double.IsNaN(value) ? "n/a" : value.ToString("0.0%", Inv);

    private static string YesNo(bool? value) => value switch { true => "yes", false => "no", null => "-" };
}
