using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Statistics;

public sealed class OutlyingRowsTests
{
    [Fact]
    public void Of_AnscombeSetIII_FlagsOnlyThePointAtThirteen()
    {
        // Anscombe (1973): set III lies on a line except (13, 12.74), the third row of the published table.
        var set = ReferenceData.Anscombe(3);

        var flags = OutlyingRows.Of(set.X, set.Y, Thresholds.DefaultOutlierT);

        Assert.Equal([2], Enumerable.Range(0, flags.Length).Where(i => flags[i]));
        Assert.Equal(12.74, set.Y[2]);
    }

    [Fact]
    public void Of_AnscombeSetI_FlagsNothing()
    {
        // Set I is ordinary scatter about y = 3 + 0.5x: no externally studentized residual reaches 3.
        var set = ReferenceData.Anscombe(1);

        Assert.DoesNotContain(true, OutlyingRows.Of(set.X, set.Y, Thresholds.DefaultOutlierT));
    }

    [Fact]
    public void Of_CountsAsTheProfileDoes()
    {
        // The plot marks the same rows the profile counts (same rule, same cut) on the NIST StRD Norris data.
        var set = ReferenceData.Norris();
        var profile = Core.Profiling.Profiler.Profile(set, Thresholds.Default);

        Assert.Equal(profile.OutlierCount, OutlyingRows.Of(set.X, set.Y, Thresholds.DefaultOutlierT).Count(f => f));
    }
}
