using System.Text;
using CsvHelper;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Sources.Csv;

/// <summary>
/// Reads an x/y column pair from a CSV extract with a header row, streaming record by record (only the
/// two parsed columns are kept). Empty cells are nulls, text cells are counted and reported with the line
/// of the first one, never a crash. Problems with the file itself throw <see cref="SourceException"/>
/// with a one-line message naming the file and column.
/// </summary>
internal static class CsvPairReader
{
    private static readonly CsvReaderOptions Options = CsvReaderOptions.Default with
    {
        // Comma always: guessing the separator could turn a broken extract into a wrong one.
        Separator = ',',
        HasHeader = true,
        TrimWhitespace = true,
        TrackLineNumbers = true,
        // RFC 4180: quoted cells may hold line breaks (a comment column, say). The cost is that one
        // unbalanced quote runs to the end of the file; OnMalformedRecord reports that, with its line.
        AllowLineBreaksInQuotes = true,
    };

    /// <param name="path">The file; messages name it as given.</param>
    public static CsvPairExtract ReadFile(string path, string xColumn, string yColumn, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrEmpty(path);
        if (Directory.Exists(path))
        {
            throw new SourceException(SourceFailure.Unreachable, $"{path} is a directory, not a CSV file");
        }

        if (!File.Exists(path))
        {
            throw new SourceException(SourceFailure.Unreachable, $"file not found: {path}");
        }

        var malformed = new CsvMalformedRecords(path);
        CsvReader csv;
        try
        {
            csv = CsvReader.FromFile(path, malformed.Watch(Options));
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new SourceException(SourceFailure.Unreachable, $"cannot read {path}: {ex.Message}", ex);
        }

        using (csv)
        {
            return Read(csv, malformed, xColumn, yColumn, cancellationToken);
        }
    }

    /// <summary>Reads CSV text from an open reader (an embedded sample, a test string); the reader stays open.</summary>
    public static CsvPairExtract Read(TextReader text, string sourceName, string xColumn, string yColumn, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(text);
        var malformed = new CsvMalformedRecords(sourceName);
        using var csv = CsvReader.Create(text, malformed.Watch(Options), leaveOpen: true);
        return Read(csv, malformed, xColumn, yColumn, cancellationToken);
    }

    private static CsvPairExtract Read(CsvReader csv, CsvMalformedRecords malformed, string xColumn, string yColumn, CancellationToken cancellationToken)
    {
        var sourceName = malformed.SourceName;
        ArgumentException.ThrowIfNullOrEmpty(xColumn);
        ArgumentException.ThrowIfNullOrEmpty(yColumn);
        try
        {
            var (xIndex, yIndex) = FindColumns(csv, sourceName, xColumn, yColumn);
            var builder = new PairedSampleBuilder();
            var xText = new TextCells(sourceName, csv.Headers[xIndex]);
            var yText = new TextCells(sourceName, csv.Headers[yIndex]);

            while (csv.Read())
            {
                if ((csv.RowNumber & 0xFFF) == 0)
                {
                    cancellationToken.ThrowIfCancellationRequested();
                }

                var xKind = CsvCell.Parse(csv.GetSpan(xIndex), out var x);
                var yKind = CsvCell.Parse(csv.GetSpan(yIndex), out var y);
                if (xKind == CsvCellKind.NotANumber || yKind == CsvCellKind.NotANumber)
                {
                    // One row, one count: the row is unusable whichever of its cells is text.
                    builder.AddNonNumeric();
                    if (xKind == CsvCellKind.NotANumber)
                    {
                        xText.Add(csv.LineNumber, csv.GetSpan(xIndex));
                    }

                    if (yKind == CsvCellKind.NotANumber)
                    {
                        yText.Add(csv.LineNumber, csv.GetSpan(yIndex));
                    }

                    continue;
                }

                builder.Add(xKind == CsvCellKind.Empty ? null : x, yKind == CsvCellKind.Empty ? null : y);
            }

            var issues = new List<CsvNonNumericCells>(2);
            xText.AddTo(issues);
            if (yIndex != xIndex)
            {
                yText.AddTo(issues);
            }

            return new CsvPairExtract(sourceName, builder.Build(), issues, malformed.Summary());
        }
        catch (CsvFormatException ex)
        {
            var where = ex.LineNumber > 0 ? $"{sourceName}:{ex.LineNumber}" : sourceName;
            throw new SourceException(SourceFailure.QueryError, $"{where}: malformed CSV: {ex.Message}", ex);
        }
        catch (IOException ex)
        {
            throw new SourceException(SourceFailure.Unreachable, $"cannot read {sourceName}: {ex.Message}", ex);
        }
    }

    private static (int X, int Y) FindColumns(CsvReader csv, string sourceName, string xColumn, string yColumn)
    {
        var headers = csv.Headers;
        if (headers.Count == 0)
        {
            throw new SourceException(SourceFailure.MissingColumn, $"{sourceName} is empty: expected a header row naming the columns");
        }

        return (Find(xColumn), Find(yColumn));

        int Find(string column) =>
            // CsvHelper matches exactly first, then ignoring case and surrounding blanks.
            csv.TryGetFieldIndex(column, out var index)
                ? index
                : throw new SourceException(
                    SourceFailure.MissingColumn,
                    $"column '{column}' not found in {sourceName} (columns: {string.Join(", ", headers)}){SeparatorHint(headers)}");
    }

    // A spreadsheet saved with a decimal-comma locale separates with ';': say so instead of leaving
    // the reader to wonder why the only "column" is the whole header line.
    private static string SeparatorHint(IReadOnlyList<string> headers) =>
        headers.Count == 1 && headers[0].IndexOfAny([';', '\t', '|']) >= 0
            ? "; the file seems to use another separator than ',' (DriftWatch reads comma-separated files)"
            : string.Empty;

    /// <summary>Counts one column's text cells and keeps the first, for the warning.</summary>
    private sealed class TextCells(string sourceName, string column)
    {
        private int _count;
        private long _firstLine;
        private string _firstValue = string.Empty;

        public void Add(long line, ReadOnlySpan<byte> value)
        {
            if (_count++ == 0)
            {
                _firstLine = line;
                _firstValue = Encoding.UTF8.GetString(value);
            }
        }

        public void AddTo(List<CsvNonNumericCells> issues)
        {
            if (_count > 0)
            {
                issues.Add(new CsvNonNumericCells(sourceName, column, _firstLine, _firstValue, _count));
            }
        }
    }
}
