using DriftWatch.Core.Baselines;

namespace DriftWatch.Core.Tests.Baselines;

public sealed class StableSeedTests
{
    // Test vectors of 32-bit FNV-1a as published with the algorithm (Fowler/Noll/Vo reference test suite; from memory).
    [Theory]
    [InlineData("", 0x811c9dc5u)]
    [InlineData("a", 0xe40c292cu)]
    [InlineData("foobar", 0xbf9cf968u)]
    public void FromName_ReferenceVectors_MatchFnv1a(string name, uint expected)
    {
        Assert.Equal(unchecked((int)expected), StableSeed.FromName(name));
    }
}
