using System.Globalization;
using System.Text;
using DriftWatch.Cli;
using DriftWatch.Output;

namespace DriftWatch.IntegrationTests.Discovery;

/// <summary>
/// A generated table of 30 numeric columns and one text column, seeded, with two derived columns planted:
/// lb = kg × 2.20462262185 (1 lb = 0.45359237 kg exactly, NIST SP 811 appendix B; the factor is its inverse to 12
/// digits) and total = net + 4.5. The other columns are independent or noisily related draws; c05 has nulls and c06
/// NaN and +∞ (PostgreSQL keeps both; SQLite stores NaN as NULL), so the matrix must use pairwise-complete finite rows.
/// Generated data: the oracles are the engine's corr() and MathNet.Numerics on the rows read back.
/// </summary>
internal static class PlantedTable
{
    public const string Name = "parcels";
    public const int Rows = 2_000;
    public const double PoundsPerKilogram = 2.20462262185;

    public static readonly string[] Columns =
        [.. Enumerable.Range(1, 26).Select(i => "c" + i.ToString("00", CultureInfo.InvariantCulture)), "kg", "lb", "net", "total"];

    public static List<double?[]> Generate()
    {
        var random = new Random(20_261_203);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
        var rows = new List<double?[]>(Rows);
        for (var i = 0; i < Rows; i++)
        {
            var row = new double?[Columns.Length];
            for (var k = 0; k < 26; k++)
            {
                row[k] = Math.Round(Normal() * 10, 3);
            }

            row[1] = Math.Round(row[0]!.Value + (Normal() * 5), 3);       // c02 follows c01, r ≈ 0.9
            row[3] = Math.Round(-row[2]!.Value + (Normal() * 10), 3);     // c04 against c03, r ≈ −0.7
            row[5] = Math.Round((2 * row[4]!.Value) + (Normal() * 15), 3); // c06 follows c05, r ≈ 0.8
            row[4] = i % 7 == 0 ? null : row[4];
            row[5] = i % 11 == 0 ? double.NaN : i % 13 == 0 ? double.PositiveInfinity : row[5];
            var kg = Math.Round(1 + (random.NextDouble() * 39), 2);
            var net = Math.Round(5 + (random.NextDouble() * 495), 2);
            row[26] = kg;
            row[27] = kg * PoundsPerKilogram;
            row[28] = net;
            row[29] = net + 4.5;
            rows.Add(row);
        }

        return rows;
    }

    /// <param name="real">The column type ("double precision", "REAL").</param>
    /// <param name="literal">How a value is written in the dialect.</param>
    public static string CreateSql(string real, Func<double?, string> literal, IEnumerable<double?[]> rows)
    {
        var sql = new StringBuilder();
        sql.Append(CultureInfo.InvariantCulture, $"CREATE TABLE {Name} ({string.Join(", ", Columns.Select(c => $"{c} {real}"))}, label text);\n");
        foreach (var chunk in rows.Chunk(250))
        {
            sql.Append(CultureInfo.InvariantCulture, $"INSERT INTO {Name} VALUES {string.Join(", ", chunk.Select(r => $"({string.Join(", ", r.Select(literal))}, 'parcel')"))};\n");
        }

        return sql.ToString();
    }

    public static async Task<(int Exit, string Out, string Error)> CliAsync(params string[] args)
    {
        using var output = new StringWriter();
        using var error = new StringWriter();
        var exit = await CliApp.RunAsync(args, CliConsole.ForWriters(output, error), CancellationToken.None);
        return (exit, output.ToString(), error.ToString());
    }

    /// <summary>Pearson's r by MathNet.Numerics over the rows where both values are finite, and how many those are.</summary>
    public static (double? R, int N) MathNetPearson(List<double?[]> rows, int i, int j)
    {
        var both = rows.Where(r => r[i] is { } a && double.IsFinite(a) && r[j] is { } b && double.IsFinite(b)).ToList();
        return (both.Count < 3 ? null : MathNet.Numerics.Statistics.Correlation.Pearson(both.Select(r => r[i]!.Value), both.Select(r => r[j]!.Value)), both.Count);
    }
}
