using System.Globalization;
using DriftWatch.Calibration.Faults;
using DriftWatch.Calibration.Generation;

namespace DriftWatch.Calibration.Running;

/// <summary>
/// The pairs of a run and its calendar: healthy pairs family by family, then one faulty pair per fault case.
/// Variants (curved, discrete) and storage styles alternate within a family so both of each appear.
/// </summary>
internal sealed record CalibrationPlan(CalibrationOptions Options, IReadOnlyList<CalibrationPair> Pairs, IReadOnlyList<FaultCase> Faults)
{
    /// <summary>Day 1; a Monday, so weekly cycles start at the week's start.</summary>
    public static readonly DateOnly FirstDate = new(2026, 3, 2);

    /// <summary>Each day's check runs at 23:30 UTC, after that day's load (rows carry times from 00:00 to 23:00).</summary>
    public static readonly TimeSpan CheckTimeOfDay = new(23, 30, 0);

    public static CalibrationPlan Build(CalibrationOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        var pairs = new List<CalibrationPair>();
        foreach (var family in HealthyFamilies.All)
        {
            for (var j = 0; j < options.PairsPerFamily; j++)
            {
                var index = pairs.Count;
                var shape = PairShapes.Draw(family, j % 2, Seeds.Random(options.Seed, index, -1));
                pairs.Add(new CalibrationPair(index, string.Create(CultureInfo.InvariantCulture, $"h-{HealthyFamilies.Name(family)}-{j + 1:00}"), Table(index), shape, Style(j), null));
            }
        }

        var faults = options.Quick ? FaultCatalog.Quick() : FaultCatalog.Full();
        for (var m = 0; m < faults.Count; m++)
        {
            var fault = faults[m];
            var index = pairs.Count;
            var shape = PairShapes.Draw(fault.Host, m % 2, Seeds.Random(options.Seed, index, -1), fault.Rows);
            if (fault.Rows is not null)
            {
                // A total row is a fault of a fixed table size: keep the size close to what the label says.
                shape = shape with { SizeJitter = 0.03 };
            }

            pairs.Add(new CalibrationPair(index, string.Create(CultureInfo.InvariantCulture, $"f-{m + 1:00}-{Slug(fault.Label)}"), Table(index), shape, Style(m), fault));
        }

        return new CalibrationPlan(options, pairs, faults);
    }

    public static DateOnly DateOf(int day) => FirstDate.AddDays(day - 1);

    public static DateTimeOffset CheckTimeOf(int day) => new(DateOf(day).ToDateTime(TimeOnly.FromTimeSpan(CheckTimeOfDay)), TimeSpan.Zero);

    /// <summary>The simulated day a stored time belongs to (checks run at 23:30 of their day).</summary>
    public static int DayOf(DateTimeOffset at) => at.UtcDateTime.Date.Subtract(FirstDate.ToDateTime(TimeOnly.MinValue)).Days + 1;

    private static string Table(int index) => string.Create(CultureInfo.InvariantCulture, $"t{index:000}");

    private static StorageStyle Style(int j) => (j + (j / 2)) % 2 == 0 ? StorageStyle.Replaced : StorageStyle.Appended;

    private static string Slug(string label)
    {
        var chars = label.ToLowerInvariant().Select(c => char.IsAsciiLetterOrDigit(c) ? c : '-').ToArray();
        var slug = new string(chars);
        while (slug.Contains("--", StringComparison.Ordinal))
        {
            slug = slug.Replace("--", "-", StringComparison.Ordinal);
        }

        return slug.Trim('-');
    }
}
