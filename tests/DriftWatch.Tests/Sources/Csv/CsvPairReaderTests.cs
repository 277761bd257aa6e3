using System.Globalization;
using DriftWatch.Sources;
using DriftWatch.Sources.Csv;

namespace DriftWatch.Tests.Sources.Csv;

public sealed class CsvPairReaderTests
{
    private static CsvPairExtract ReadText(string csv, string x = "x", string y = "y")
    {
        using var reader = new StringReader(csv);
        return CsvPairReader.Read(reader, "extract.csv", x, y, CancellationToken.None);
    }

    [Fact]
    public void Read_QuotedFieldsWithCommasAndQuotes_ReadAsOneCell()
    {
        // RFC 4180 §2: a quoted field may contain commas, and a doubled quote stands for one quote.
        var extract = ReadText(
            "name,x,y\n" +
            "\"Smith, J.\",1.5,\"2.25\"\n" +
            "\"say \"\"hi\"\", then 3\",\" 3 \",4\n");

        Assert.Equal([1.5, 3.0], extract.Sample.X);
        Assert.Equal([2.25, 4.0], extract.Sample.Y);
        Assert.Empty(extract.NonNumeric);
        Assert.Null(extract.Malformed);
    }

    [Fact]
    public void Read_EmptyCells_CountedAsNullRows()
    {
        var extract = ReadText("x,y\n1,2\n,3\n4,\n  ,  \n5,6\n");

        Assert.Equal(2, extract.Sample.UsedCount);
        Assert.Equal(3, extract.Sample.NullCount);
        Assert.Equal(5, extract.Sample.RowCount);
        Assert.Empty(extract.NonNumeric);
    }

    [Fact]
    public void Read_ShortRow_MissingCellIsNull()
    {
        var extract = ReadText("x,y\n1,2\n3\n");

        Assert.Equal(1, extract.Sample.UsedCount);
        Assert.Equal(1, extract.Sample.NullCount);
    }

    [Fact]
    public void ReadFile_TextCells_CountedWithFirstLineCountingLinesInsideQuotes()
    {
        // text_cells.csv: record 2 spans lines 3–4 (a quoted line break, RFC 4180 §2.6), so the first
        // text cell of y ("abc") is on line 5 of the file and the x text ("n/a") on line 6.
        var path = TestData.Path("csv", "text_cells.csv");

        var extract = CsvPairReader.ReadFile(path, "x", "y", CancellationToken.None);

        Assert.Equal([1.0, 2.0, 6.0], extract.Sample.X);
        Assert.Equal([2.0, 4.1, 12.5], extract.Sample.Y);
        Assert.Equal(3, extract.Sample.NonNumericCount);
        Assert.Equal(6, extract.Sample.RowCount);
        var x = Assert.Single(extract.NonNumeric, n => n.Column == "x");
        Assert.Equal((6L, "n/a", 1), (x.Line, x.FirstValue, x.Count));
        var y = Assert.Single(extract.NonNumeric, n => n.Column == "y");
        Assert.Equal((5L, "abc", 2), (y.Line, y.FirstValue, y.Count));
        Assert.Equal($"{path}:5: column 'y' value 'abc' is not a number (2 such cells)", y.Message);
        Assert.Equal($"{path}:6: column 'x' value 'n/a' is not a number (1 such cell)", x.Message);
    }

    [Fact]
    public void Read_NaNAndInfinities_CountedNonFiniteNotText()
    {
        // The invariant culture's symbols are "NaN" and "Infinity" (.NET NumberFormatInfo.InvariantInfo);
        // "inf" is how Python's float() and NumPy write infinity.
        var extract = ReadText("x,y\n1,NaN\nInfinity,2\n3,-Infinity\n4,inf\nnan,5\n6,7\n");

        Assert.Equal(1, extract.Sample.UsedCount);
        Assert.Equal(5, extract.Sample.NonFiniteCount);
        Assert.Equal(0, extract.Sample.NonNumericCount);
        Assert.Empty(extract.NonNumeric);
    }

    [Fact]
    public void Read_ThousandsSeparator_IsTextNotGuessed()
    {
        var extract = ReadText("x,y\n1,\"1,234\"\n2,1e3\n");

        Assert.Equal([1000.0], extract.Sample.Y);
        Assert.Equal("1,234", Assert.Single(extract.NonNumeric).FirstValue);
    }

    [Fact]
    public void Read_MissingColumn_ThrowsNamingColumnFileAndColumns()
    {
        var ex = Assert.Throws<SourceException>(() => ReadText("a,b,c\n1,2,3\n", x: "a", y: "spend"));

        Assert.Equal(SourceFailure.MissingColumn, ex.Failure);
        Assert.Equal("column 'spend' not found in extract.csv (columns: a, b, c)", ex.Message);
    }

    [Fact]
    public void Read_ColumnNameDiffersInCaseAndBlanks_Found()
    {
        var extract = ReadText(" Oven Hours ,Loaves\n1,2\n", x: "oven hours", y: "loaves");

        Assert.Equal([1.0], extract.Sample.X);
    }

    [Fact]
    public void Read_EmptyInput_ThrowsSayingHeaderExpected()
    {
        var ex = Assert.Throws<SourceException>(() => ReadText(string.Empty));

        Assert.Contains("extract.csv is empty", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ReadFile_MissingFile_ThrowsNamingFile()
    {
        var path = Path.Combine(Path.GetTempPath(), "driftwatch-no-such-" + Guid.NewGuid().ToString("N") + ".csv");

        var ex = Assert.Throws<SourceException>(() => CsvPairReader.ReadFile(path, "x", "y", CancellationToken.None));

        Assert.Equal(SourceFailure.Unreachable, ex.Failure);
        Assert.Equal($"file not found: {path}", ex.Message);
    }

    [Fact]
    public void Read_UnterminatedQuote_ReportedWithLine()
    {
        var extract = ReadText("x,y\n1,2\n3,\"4\n5,6\n");

        Assert.Equal("extract.csv:3: a quoted cell is never closed, so the rest of the file was read as one cell", extract.Malformed);
    }

    [Fact]
    public void Read_CurrentCultureUsesDecimalComma_ParsingUnchanged()
    {
        // German number format (decimal comma, full stop for thousands; CLDR de-DE, common practice).
        // The build runs in invariant-globalization mode, where "de-DE" cannot be loaded, so the test
        // builds a culture with exactly that number format.
        var german = (CultureInfo)CultureInfo.InvariantCulture.Clone();
        german.NumberFormat.NumberDecimalSeparator = ",";
        german.NumberFormat.NumberGroupSeparator = ".";
        var saved = CultureInfo.CurrentCulture;
        try
        {
            CultureInfo.CurrentCulture = german;
            CultureInfo.CurrentUICulture = german;
            // The culture is in effect: under it, "2.5" would not be a decimal number.
            Assert.False(double.TryParse("2.5", NumberStyles.Float, CultureInfo.CurrentCulture, out _));

            var extract = ReadText("x,y\n1.5,2.5\n\"3,5\",1e-3\n");

            Assert.Equal([1.5], extract.Sample.X);
            Assert.Equal([2.5], extract.Sample.Y);
            Assert.Equal("3,5", Assert.Single(extract.NonNumeric).FirstValue);
        }
        finally
        {
            CultureInfo.CurrentCulture = saved;
            CultureInfo.CurrentUICulture = saved;
        }
    }

    [Fact]
    public void ReadFile_Utf8ByteOrderMark_HeaderStillMatches()
    {
        // Spreadsheet programs commonly start UTF-8 CSV exports with the byte order mark EF BB BF
        // (Unicode Standard, §2.6 "Encoding Schemes"); it must not become part of the first column's name.
        var path = Path.Combine(Path.GetTempPath(), "driftwatch-bom-" + Guid.NewGuid().ToString("N") + ".csv");
        File.WriteAllBytes(path, [0xEF, 0xBB, 0xBF, .. "x,y\n1,2\n"u8.ToArray()]);
        try
        {
            var extract = CsvPairReader.ReadFile(path, "x", "y", CancellationToken.None);

            Assert.Equal([1.0], extract.Sample.X);
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void Read_SemicolonSeparated_MissingColumnMessageHintsAtSeparator()
    {
        var ex = Assert.Throws<SourceException>(() => ReadText("x;y\n1,5;2\n"));

        Assert.Equal(
            "column 'x' not found in extract.csv (columns: x;y); the file seems to use another separator than ',' (DriftWatch reads comma-separated files)",
            ex.Message);
    }
}
