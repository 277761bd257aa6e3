using System.Globalization;
using System.Text;

namespace DriftWatch.Sources.Csv;

internal enum CsvCellKind
{
    Empty,
    Number,
    NotANumber,
}

/// <summary>Reads one CSV cell as a number: invariant culture always, whatever the machine's culture.</summary>
internal static class CsvCell
{
    // Float allows surrounding blanks, a sign, a decimal point and an exponent, but no thousands
    // separators: in an extract "1,234" is ambiguous and is better reported than guessed. (CsvHelper's
    // own Parse<double> allows thousands separators, which is why the cell is parsed here.)
    private const NumberStyles Style = NumberStyles.Float;

    /// <summary>
    /// Empty or blank is <see cref="CsvCellKind.Empty"/> (null). "NaN", "Infinity" and "-Infinity" (any
    /// case) and "inf"/"-inf" (what Python and NumPy write) are non-finite numbers, which the sample
    /// builder counts apart from text.
    /// </summary>
    public static CsvCellKind Parse(ReadOnlySpan<byte> utf8, out double value)
    {
        var text = utf8.Trim(" \t"u8);
        if (text.IsEmpty)
        {
            value = 0;
            return CsvCellKind.Empty;
        }

        if (double.TryParse(text, Style, CultureInfo.InvariantCulture, out value))
        {
            return CsvCellKind.Number;
        }

        if (Ascii.EqualsIgnoreCase(text, "inf"u8) || Ascii.EqualsIgnoreCase(text, "+inf"u8))
        {
            value = double.PositiveInfinity;
            return CsvCellKind.Number;
        }

        if (Ascii.EqualsIgnoreCase(text, "-inf"u8))
        {
            value = double.NegativeInfinity;
            return CsvCellKind.Number;
        }

        return CsvCellKind.NotANumber;
    }
}
