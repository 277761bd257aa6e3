using System.Globalization;
using DriftWatch.Calibration.Generation;
using DriftWatch.Core.Findings;

namespace DriftWatch.Calibration.Faults;

/// <summary>
/// The faults the suite injects. Each is put into a pair of one healthy family, taken in turn from
/// <see cref="Hosts"/> (every family except the weak one, whose r of 0.3 is not a relationship anyone
/// would watch for a 15 % slope change). The expected kinds are those that describe the fault: an alert of
/// any of them within two checks counts as caught.
/// </summary>
internal static class FaultCatalog
{
    public static IReadOnlyList<HealthyFamily> Hosts { get; } =
    [
        HealthyFamily.LinearNormal, HealthyFamily.HeavyTails, HealthyFamily.Heteroscedastic, HealthyFamily.Curved,
        HealthyFamily.Discrete, HealthyFamily.SkewedZeroInflated, HealthyFamily.Negative, HealthyFamily.WeeklyVolume,
        HealthyFamily.WeeklyLevel, HealthyFamily.CrossingCutoff, HealthyFamily.Small,
    ];

    public static readonly double[] UnitFactors = [1.609344, 2.20462, 1000, 100, 3.6];

    private static readonly FindingKind[] Exactness = [FindingKind.BecamePerfect, FindingKind.PerfectRelationship];
    private static readonly FindingKind[] PartialCopy = [FindingKind.PartlyDerived, FindingKind.BecamePerfect, FindingKind.CorrelationShift];
    private static readonly FindingKind[] Slope = [FindingKind.SlopeShift];
    private static readonly FindingKind[] Offset = [FindingKind.OffsetShift];
    // A shuffled key on a share f of rows also flattens the slope to about (1 − f)·b (regression dilution).
    private static readonly FindingKind[] Scrambled = [FindingKind.CorrelationShift, FindingKind.RelationshipLost, FindingKind.OutlierSurge, FindingKind.SlopeShift];
    private static readonly FindingKind[] Stray = [FindingKind.OutlierSurge, FindingKind.LeverageAppeared, FindingKind.CorrelationShift, FindingKind.RelationshipLost];
    private static readonly FindingKind[] Nulls = [FindingKind.NullSurge];
    private static readonly FindingKind[] Sign = [FindingKind.SignFlip];
    private static readonly FindingKind[] Shrunk = [FindingKind.SampleShrank];
    private static readonly FindingKind[] Bent = [FindingKind.CurvatureAppeared, FindingKind.SlopeShift];
    private static readonly FindingKind[] Total = [FindingKind.HiddenRowsDriveLine, FindingKind.LeverageAppeared, FindingKind.SinglePointLeverage, FindingKind.OutlierSurge, FindingKind.CorrelationShift, FindingKind.SlopeShift];

    /// <summary>Every fault at every size (the full run).</summary>
    public static IReadOnlyList<FaultCase> Full() => Assign(Cases(includeLarge: true));

    /// <summary>Each fault type at its main size (the quick preset): the bar's smallest size, or the must-detect one.</summary>
    public static IReadOnlyList<FaultCase> Quick() => Assign(Cases(includeLarge: false).Where(c => c.Main));

    private static IEnumerable<FaultCase> Cases(bool includeLarge)
    {
        var host = HealthyFamily.LinearNormal; // replaced in Assign, except where a case fixes its own
        yield return new(FaultType.CopyXIntoY, 1, FaultColumn.Y, "copy x into y", host, Exactness, Main: true);
        yield return new(FaultType.AffineDerivation, 1, FaultColumn.Y, "affine y=a+bx, all rows", host, Exactness);
        yield return new(FaultType.AffineDerivation, 0.5, FaultColumn.Y, "affine y=a+bx, 50% rows", host, PartialCopy);
        yield return new(FaultType.AffineDerivation, 0.3, FaultColumn.Y, "affine y=a+bx, 30% rows", host, PartialCopy, Main: true);
        foreach (var f in UnitFactors)
        {
            var text = f.ToString(CultureInfo.InvariantCulture);
            yield return new(FaultType.UnitChange, f, FaultColumn.Y, $"unit y×{text}", host, Slope, Main: f == 1000);
            yield return new(FaultType.UnitChange, 1 / f, FaultColumn.Y, $"unit y×1/{text}", host, Slope, Main: f == 3.6);
            yield return new(FaultType.UnitChange, f, FaultColumn.X, $"unit x×{text}", host, Slope, Main: f == 1.609344);
        }

        yield return new(FaultType.SlopeChange, 0.15, FaultColumn.Y, "slope +15%", host, Slope, Main: true);
        yield return new(FaultType.SlopeChange, 0.30, FaultColumn.Y, "slope +30%", host, Slope);
        yield return new(FaultType.SlopeChange, -0.15, FaultColumn.Y, "slope -15%", host, Slope);
        yield return new(FaultType.Offset, 1, FaultColumn.Y, "offset +1 SD", host, Offset, Main: true);
        yield return new(FaultType.Offset, 2, FaultColumn.Y, "offset +2 SD", host, Offset);
        yield return new(FaultType.Offset, -1, FaultColumn.Y, "offset -1 SD", host, Offset);
        yield return new(FaultType.KeyMisalignment, 0.2, FaultColumn.Y, "misaligned 20% rows", host, Scrambled, Main: true);
        yield return new(FaultType.KeyMisalignment, 0.5, FaultColumn.Y, "misaligned 50% rows", host, Scrambled);
        yield return new(FaultType.Sentinel, 0.01, FaultColumn.Y, "sentinel y=99999, 1%", host, Stray, Main: true, Value: 99999);
        yield return new(FaultType.Sentinel, 0.05, FaultColumn.Y, "sentinel y=-1, 5%", host, Stray, Value: -1);
        yield return new(FaultType.Sentinel, 0.01, FaultColumn.X, "sentinel x=0, 1%", host, Stray, Value: 0);
        yield return new(FaultType.Sentinel, 0.05, FaultColumn.Y, "sentinel y=0, 5%", host, Stray, Value: 0);
        yield return new(FaultType.Nulls, 0.1, FaultColumn.Y, "nulls y 10%", host, Nulls);
        yield return new(FaultType.Nulls, 0.3, FaultColumn.Y, "nulls y 30%", host, Nulls, Main: true);
        yield return new(FaultType.Nulls, 0.1, FaultColumn.X, "nulls x 10%", host, Nulls);
        yield return new(FaultType.SignFlip, 1, FaultColumn.Y, "sign flip y=-y", host, Sign, Main: true);
        yield return new(FaultType.RowsCut, 0.5, FaultColumn.Y, "rows cut to 50%", host, Shrunk);
        yield return new(FaultType.RowsCut, 0.2, FaultColumn.Y, "rows cut to 20%", host, Shrunk, Main: true);
        yield return new(FaultType.Cap, 0.9, FaultColumn.Y, "cap y at p90", host, Bent);
        yield return new(FaultType.Cap, 0.8, FaultColumn.Y, "cap y at p80", host, Bent, Main: true);
        yield return new(FaultType.AggregateRow, 1, FaultColumn.Y, "total row, 5k rows", HealthyFamily.LinearNormal, Total, Rows: 5_000);
        yield return new(FaultType.AggregateRow, 1, FaultColumn.Y, "total row, 60k rows", HealthyFamily.LinearNormal, Total, Rows: 60_000, Main: true);
        if (includeLarge)
        {
            yield return new(FaultType.AggregateRow, 1, FaultColumn.Y, "total row, 300k rows", HealthyFamily.LinearNormal, Total, Rows: 300_000);
        }
    }

    private static List<FaultCase> Assign(IEnumerable<FaultCase> cases)
    {
        var list = new List<FaultCase>();
        var turn = 0;
        foreach (var c in cases)
        {
            list.Add(c.Rows is null ? c with { Host = Hosts[turn++ % Hosts.Count] } : c);
        }

        return list;
    }
}
