using CsvHelper;

namespace DriftWatch.Sources.Csv;

/// <summary>Collects the records CsvHelper had to recover (bad quoting, ragged rows) into one warning.</summary>
internal sealed class CsvMalformedRecords(string sourceName)
{
    private int _count;
    private CsvMalformedReason _firstReason;
    private long _firstLine;

    public string SourceName { get; } = sourceName;

    public CsvReaderOptions Watch(CsvReaderOptions options) => options with { OnMalformedRecord = Add };

    /// <summary>Null when every record was well formed.</summary>
    public string? Summary()
    {
        if (_count == 0)
        {
            return null;
        }

        var what = _firstReason switch
        {
            CsvMalformedReason.UnterminatedQuote => "a quoted cell is never closed, so the rest of the file was read as one cell",
            CsvMalformedReason.StrayQuote => "a quote inside an unquoted cell was kept as text",
            CsvMalformedReason.TextAfterClosingQuote => "text after a closing quote was appended to the cell",
            CsvMalformedReason.FieldCountMismatch => "the record has a different number of cells than the header",
            _ => $"malformed record ({_firstReason})",
        };
        var more = _count > 1 ? $" ({_count} malformed records)" : string.Empty;
        return $"{SourceName}:{_firstLine}: {what}{more}";
    }

    private void Add(CsvMalformedRecord record)
    {
        if (_count++ == 0)
        {
            _firstReason = record.Reason;
            _firstLine = record.LineNumber;
        }
    }
}
