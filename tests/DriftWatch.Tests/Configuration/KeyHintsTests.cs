using DriftWatch.Configuration;

namespace DriftWatch.Tests.Configuration;

public sealed class KeyHintsTests
{
    // Worked examples of edit distances from the Wikipedia articles "Levenshtein distance" and
    // "Damerau–Levenshtein distance" (from memory): kitten→sitting 3, flaw→lawn 2, and CA→ABC, which the
    // optimal-string-alignment variant scores 3 (the unrestricted Damerau distance would be 2).
    [Theory]
    [InlineData("kitten", "sitting", 3)]
    [InlineData("flaw", "lawn", 2)]
    [InlineData("CA", "ABC", 3)]
    [InlineData("smaple", "sample", 1)]
    [InlineData("", "abc", 3)]
    [InlineData("same", "same", 0)]
    public void Distance_KnownPairs_MatchWorkedExamples(string a, string b, int expected)
    {
        Assert.Equal(expected, KeyHints.Distance(a, b));
        Assert.Equal(expected, KeyHints.Distance(b, a));
    }

    [Theory]
    [InlineData("conection", "connection")]
    [InlineData("Rows", "rows")]
    [InlineData("statment_timeout", "statement_timeout")]
    [InlineData("treshold", "thresholds")]
    [InlineData("colour", null)]
    public void Closest_Slips_AreHintedOthersAreNot(string unknown, string? expected)
    {
        string[] allowed = ["name", "kind", "connection", "rows", "statement_timeout", "thresholds", "tags"];
        Assert.Equal(expected, KeyHints.Closest(unknown, allowed));
    }
}
