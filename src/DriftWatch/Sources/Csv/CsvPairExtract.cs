using DriftWatch.Core.Profiling;

namespace DriftWatch.Sources.Csv;

/// <summary>One CSV extract of a pair: the usable sample and what was wrong with the rest.</summary>
/// <param name="NonNumeric">Per column (x first), the cells that held text instead of a number.</param>
/// <param name="Malformed">One line about records with broken quoting or a ragged cell count; null when there were none.</param>
internal sealed record CsvPairExtract(
    string SourceName,
    PairedSample Sample,
    IReadOnlyList<CsvNonNumericCells> NonNumeric,
    string? Malformed)
{
    /// <summary>Every warning about the extract, one line each, for stderr.</summary>
    public IEnumerable<string> Warnings =>
        Malformed is null ? NonNumeric.Select(n => n.Message) : NonNumeric.Select(n => n.Message).Prepend(Malformed);
}
