using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;

namespace DriftWatch.Core.Tests.Alerting;

public sealed class FalseDiscoveryControlTests
{
    // Benjamini & Hochberg (1995), J. R. Statist. Soc. B 57(1), 289–300, the paper's worked example: the 15
    // p-values of a multiple-endpoint clinical study. At q = 0.05 the step-up procedure rejects the four
    // smallest. Values and result from memory (not read from the paper while writing this test).
    private static readonly double[] PaperPValues =
        [0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.000];

    [Fact]
    public void BenjaminiHochberg_PaperExample_KeepsTheFourSmallest()
    {
        var kept = FalseDiscoveryControl.BenjaminiHochberg(PaperPValues, p => p, 0.05);

        Assert.Equal([0.0001, 0.0004, 0.0019, 0.0095], kept);
    }

    [Fact]
    public void BenjaminiHochberg_PaperExampleShuffled_KeepsTheSameFourInInputOrder()
    {
        double[] shuffled = [0.6528, 0.0095, 1.000, 0.0201, 0.0001, 0.3240, 0.0459, 0.0019, 0.7590, 0.0278, 0.0344, 0.4262, 0.0004, 0.0298, 0.5719];

        var kept = FalseDiscoveryControl.BenjaminiHochberg(shuffled, p => p, 0.05);

        Assert.Equal([0.0095, 0.0001, 0.0019, 0.0004], kept);
    }

    [Fact]
    public void BenjaminiHochberg_StepUp_KeepsSmallerPValuesThatMissTheirOwnBound()
    {
        // The step-up rule as the paper defines it (from memory; also the textbook statement, common practice): find the largest k with p(k) <= k q / m and reject H(1)..H(k),
        // even where a smaller p(i) exceeds i q / m. Here m = 4, q = 0.05: bounds 0.0125, 0.025, 0.0375, 0.05;
        // p(1) = 0.02 misses its bound but p(4) = 0.04 meets its own, so all four are kept.
        double[] ps = [0.02, 0.03, 0.035, 0.04];

        var kept = FalseDiscoveryControl.BenjaminiHochberg(ps, p => p, 0.05);

        Assert.Equal(ps, kept);
    }

    [Fact]
    public void BenjaminiHochberg_NoPValueMeetsItsBound_KeepsOnlyUntestedItems()
    {
        (string Name, double? P)[] items = [("a", 0.2), ("b", null), ("c", 0.04), ("d", 0.9)];

        var kept = FalseDiscoveryControl.BenjaminiHochberg(items, i => i.P, 0.05);

        // m = 3 (the null is not a test): bounds 0.0167, 0.0333, 0.05 against 0.04, 0.2, 0.9: no rejection.
        Assert.Equal(["b"], kept.Select(i => i.Name));
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(-0.1)]
    [InlineData(1.5)]
    [InlineData(double.NaN)]
    public void BenjaminiHochberg_QOutsideUnitInterval_Throws(double q) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => FalseDiscoveryControl.BenjaminiHochberg(PaperPValues, p => p, q));

    [Fact]
    public void FilterCycle_PoolsPValuesAcrossPairs_AndPassesFindingsWithoutPValue()
    {
        // The paper's 15 p-values spread over three pairs: the procedure must see all 15 together.
        var outcomes = Enumerable.Range(0, 3)
            .Select(pair => PairOutcome.Success(
                $"pair{pair}",
                pair,
                [.. PaperPValues.Where((_, i) => i % 3 == pair).Select(p => Finding(p)), new Finding(FindingKind.NullSurge, Severity.Warning, null, 0.1, "nulls")]))
            .ToArray();

        var filtered = FalseDiscoveryControl.FilterCycle(outcomes, 0.05);

        var keptP = filtered.SelectMany(o => o.Findings).Where(f => f.PValue is not null).Select(f => f.PValue!.Value).Order();
        Assert.Equal([0.0001, 0.0004, 0.0019, 0.0095], keptP);
        Assert.All(filtered, o => Assert.Single(o.Findings, f => f.Kind == FindingKind.NullSurge));
        Assert.Equal(["pair0", "pair1", "pair2"], filtered.Select(o => o.Pair));
    }

    [Fact]
    public void FilterCycle_InfoFindingsAndOpenAlerts_AreNotTestsAndPassUntouched()
    {
        // The paper's 15 p-values as new warnings of three pairs (as above: four survive at q = 0.05), plus an
        // info finding with p = 0.9 and a warning with p = 0.04 that continues pair0's open alert of its kind.
        var outcomes = Enumerable.Range(0, 3)
            .Select(pair => PairOutcome.Success(
                $"pair{pair}",
                pair,
                [.. PaperPValues.Where((_, i) => i % 3 == pair).Select(p => Finding(p))]))
            .ToArray();
        outcomes[0] = outcomes[0] with
        {
            Findings = [.. outcomes[0].Findings, new Finding(FindingKind.MarginalShift, Severity.Info, 0.9, 0.1, "info"), new Finding(FindingKind.OffsetShift, Severity.Warning, 0.04, 0.6, "open")],
        };

        var filtered = FalseDiscoveryControl.FilterCycle(outcomes, 0.05, [("pair0", FindingKind.OffsetShift)]);

        var kept = filtered.SelectMany(o => o.Findings).ToArray();
        Assert.Equal([0.0001, 0.0004, 0.0019, 0.0095], kept.Where(f => f.Kind == FindingKind.CorrelationShift).Select(f => f.PValue!.Value).Order());
        Assert.Single(kept, f => f.Kind == FindingKind.MarginalShift);
        Assert.Single(kept, f => f.Kind == FindingKind.OffsetShift);
    }

    [Fact]
    public void FilterCycle_QNull_ReturnsOutcomesUnchanged()
    {
        PairOutcome[] outcomes = [PairOutcome.Success("p", 1, [Finding(0.9)])];

        Assert.Same(outcomes, FalseDiscoveryControl.FilterCycle(outcomes, null));
    }

    private static Finding Finding(double p) => new(FindingKind.CorrelationShift, Severity.Warning, p, 0.2, $"p={p}");
}
