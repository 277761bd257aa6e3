using System.Globalization;
using System.Text;
using DriftWatch.Calibration.Generation;

namespace DriftWatch.Calibration.Running;

/// <summary>
/// The configuration a run loads through the real loader: one source, a SQLite store in the run's folder, and
/// every default untouched except what the scenario needs (each pair's table, appended tables' window, and
/// <c>first_runs</c> only when <c>--baseline-days</c> is not the default 5).
/// </summary>
internal static class CalibrationConfigYaml
{
    public const string SourceName = "calibration";
    public const string StoreFile = "store.db";

    public static string Build(CalibrationPlan plan, ISourceDatabase source)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(source);
        var s = new StringBuilder();
        s.Append(CultureInfo.InvariantCulture, $"""
            # DriftWatch calibration run (invented data, seed {plan.Options.Seed}): healthy families and injected faults.
            sources:
              - name: {SourceName}

            """);
        s.Append(source.SourceYaml);
        s.Append(CultureInfo.InvariantCulture, $"""
            store:
              kind: sqlite
              connection: {StoreFile}

            """);
        if (plan.Options.BaselineDays != CalibrationOptions.DefaultBaselineDays)
        {
            s.Append(CultureInfo.InvariantCulture, $"""
                defaults:
                  baseline: {"{"}first_runs: {plan.Options.BaselineDays}{"}"}

                """);
        }

        s.Append("pairs:\n");
        foreach (var pair in plan.Pairs)
        {
            s.Append(CultureInfo.InvariantCulture, $"""
                  - name: {pair.Name}
                    source: {SourceName}
                    table: {pair.Table}
                    x: {CalibrationPair.XColumn}
                    y: {CalibrationPair.YColumn}

                """);
            if (pair.Storage == StorageStyle.Appended)
            {
                s.Append(CultureInfo.InvariantCulture, $"    window: {{column: {CalibrationPair.TimeColumn}, last: 24h}}\n");
            }
        }

        return s.ToString();
    }
}
