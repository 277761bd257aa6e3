using System.Text;

namespace DriftWatch.Calibration.Reporting;

/// <summary>A plain aligned text table: text columns left-aligned, columns whose header starts with '>' right-aligned.</summary>
internal sealed class TextTable(params string[] headers)
{
    private readonly List<string[]> _rows = [];

    public void Add(params string[] cells) => _rows.Add(cells);

    public void WriteTo(StringBuilder output, string indent = "  ")
    {
        ArgumentNullException.ThrowIfNull(output);
        var right = headers.Select(h => h.StartsWith('>')).ToArray();
        var names = headers.Select(h => h.TrimStart('>')).ToArray();
        var widths = names.Select((h, i) => Math.Max(h.Length, _rows.Count == 0 ? 0 : _rows.Max(r => i < r.Length ? r[i].Length : 0))).ToArray();
        Line(output, indent, names, widths, right);
        output.Append(indent).AppendJoin("  ", widths.Select(w => new string('-', w))).AppendLine();
        foreach (var row in _rows)
        {
            Line(output, indent, row, widths, right);
        }
    }

    private static void Line(StringBuilder output, string indent, string[] cells, int[] widths, bool[] right)
    {
        var parts = widths.Select((w, i) =>
        {
            var cell = i < cells.Length ? cells[i] : string.Empty;
            return right[i] ? cell.PadLeft(w) : cell.PadRight(w);
        });
        output.Append(indent).Append(string.Join("  ", parts).TrimEnd()).AppendLine();
    }
}
