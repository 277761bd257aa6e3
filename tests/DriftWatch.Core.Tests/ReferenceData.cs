using System.Globalization;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.Tests;

/// <summary>Published data sets copied into Data/ (see Data/README.md for the citations).</summary>
internal static class ReferenceData
{
    /// <summary>Anscombe (1973), set 1–4.</summary>
    public static PairedSample Anscombe(int set)
    {
        var rows = Rows("anscombe.csv").Where(r => r[0] == set.ToString(CultureInfo.InvariantCulture)).ToList();
        return new PairedSample([.. rows.Select(r => Parse(r[1]))], [.. rows.Select(r => Parse(r[2]))]);
    }

    /// <summary>NIST StRD Norris (the file's columns are y, x).</summary>
    public static PairedSample Norris()
    {
        var rows = Rows("norris.csv").ToList();
        return new PairedSample([.. rows.Select(r => Parse(r[1]))], [.. rows.Select(r => Parse(r[0]))]);
    }

    /// <summary>NIST StRD NumAcc2–4 pattern: the centre value, then <paramref name="pairs"/> pairs of centre ∓ 0.1.</summary>
    public static double[] NumAcc(double low, double centre, double high, int pairs = 500)
    {
        var values = new List<double> { centre };
        for (int i = 0; i < pairs; i++)
        {
            values.Add(low);
            values.Add(high);
        }

        return [.. values];
    }

    private static IEnumerable<string[]> Rows(string file) =>
        File.ReadLines(Path.Combine(AppContext.BaseDirectory, "Data", file)).Skip(1).Where(l => l.Length > 0).Select(l => l.Split(','));

    private static double Parse(string s) => double.Parse(s, CultureInfo.InvariantCulture);
}
