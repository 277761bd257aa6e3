using System.CommandLine;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Statistics;
using DriftWatch.Output;
using DriftWatch.Sources;
using DriftWatch.Sources.Csv;

namespace DriftWatch.Cli;

/// <summary>
/// <c>driftwatch profile</c>: profiles one CSV extract of a column pair, or compares it with a baseline
/// extract. The triage tool for two exports; with no --csv it runs on the bundled sample.
/// </summary>
internal static class ProfileCommand
{
    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);

        var csv = new Option<string?>("--csv")
        {
            Description = "The current extract: a CSV file with a header row, comma-separated, numbers in invariant form (1234.5). Without it the bundled sample is profiled.",
            HelpName = "FILE",
        };
        var x = new Option<string?>("--x") { Description = "Column of the current extract that holds x (the driver).", HelpName = "COLUMN" };
        var y = new Option<string?>("--y") { Description = "Column of the current extract that holds y (the value that should follow x).", HelpName = "COLUMN" };
        var baselineCsv = new Option<string?>("--baseline-csv")
        {
            Description = "A baseline extract of the same pair (from a time it was healthy) to compare the current extract with.",
            HelpName = "FILE",
        };
        var baselineX = new Option<string?>("--baseline-x") { Description = "Column of the baseline extract that holds x, if not named as --x.", HelpName = "COLUMN" };
        var baselineY = new Option<string?>("--baseline-y") { Description = "Column of the baseline extract that holds y, if not named as --y.", HelpName = "COLUMN" };
        var format = CommonOptions.Format();
        var declaredExact = new Option<bool>("--declared-exact")
        {
            Description = "Declare the pair exact, as declared: {exact: true} does in a config file: y is meant to be an exact function of x (a derived column), so exactness is healthy and losing it is the finding.",
        };
        var alpha = CommonOptions.Number(
            "--alpha",
            0,
            1,
            $"Significance level of every test in the comparison (default {Invariant(Thresholds.DefaultAlpha)}).",
            "P");
        var outlierT = CommonOptions.Number(
            "--outlier-t",
            0,
            double.PositiveInfinity,
            $"A point is an outlier when its externally studentized residual exceeds this in absolute value (default {Invariant(Thresholds.DefaultOutlierT)}).",
            "T");

        var command = new Command(
            "profile",
            "Profile the relationship of two numeric CSV columns, or compare a current extract with a baseline extract. " +
            "Exit code 0: no finding at warning or worse; 1: at least one; 2: bad input; 3: the extract has nothing to measure.\n\n" +
            "Example: driftwatch profile --csv orders_today.csv --x items --y total --baseline-csv orders_march.csv")
        {
            csv, x, y, baselineCsv, baselineX, baselineY, format, declaredExact, alpha, outlierT,
        };

        command.Validators.Add(result =>
        {
            var hasCsv = result.GetValue(csv) is not null;
            if (hasCsv && (result.GetValue(x) is null || result.GetValue(y) is null))
            {
                result.AddError("--csv needs --x and --y to name the two columns");
            }

            if (!hasCsv)
            {
                var stray = new Option[] { x, y, baselineCsv, baselineX, baselineY }.Where(o => result.GetResult(o) is not null).Select(o => o.Name).ToList();
                if (stray.Count > 0)
                {
                    var verb = stray.Count == 1 ? "needs" : "need";
                    result.AddError($"{string.Join(", ", stray)} {verb} --csv (without --csv the bundled sample is profiled)");
                }
            }
            else if (result.GetValue(baselineCsv) is null && (result.GetResult(baselineX) is not null || result.GetResult(baselineY) is not null))
            {
                result.AddError("--baseline-x and --baseline-y need --baseline-csv");
            }
        });

        command.SetAction((parsed, cancellationToken) =>
        {
            var request = new ProfileRequest(
                parsed.GetValue(csv),
                parsed.GetValue(x),
                parsed.GetValue(y),
                parsed.GetValue(baselineCsv),
                parsed.GetValue(baselineX),
                parsed.GetValue(baselineY),
                new PairDeclaration(Exact: parsed.GetValue(declaredExact)),
                Thresholds.Default with
                {
                    Alpha = parsed.GetValue(alpha) ?? Thresholds.DefaultAlpha,
                    OutlierT = parsed.GetValue(outlierT) ?? Thresholds.DefaultOutlierT,
                });
            return Task.FromResult(Run(console, request, parsed.GetValue(format), cancellationToken));
        });

        return command;
    }

    private static string Invariant(double value) => value.ToString(System.Globalization.CultureInfo.InvariantCulture);

    private sealed record ProfileRequest(
        string? Csv,
        string? X,
        string? Y,
        string? BaselineCsv,
        string? BaselineX,
        string? BaselineY,
        PairDeclaration Declared,
        Thresholds Thresholds);

    private static int Run(CliConsole console, ProfileRequest request, OutputFormat format, CancellationToken cancellationToken)
    {
        var (current, baseline, labels) = request.Csv is null
            ? ReadBundledSample(console, cancellationToken)
            : ReadFiles(request, cancellationToken);

        foreach (var warning in current.Warnings.Concat(baseline?.Warnings ?? []))
        {
            console.WriteWarning(warning);
        }

        var report = ProfileAnalysis.Run(current.Sample, baseline?.Sample, request.Declared, request.Thresholds, labels);
        if (format == OutputFormat.Json)
        {
            console.Out.WriteLine(JsonContract.Serialize(JsonContract.ToJson(report)));
        }
        else
        {
            ProfileView.Render(console.Ansi, report);
        }

        if (report.Unmeasurable is not null)
        {
            return ExitCodes.RunFailures;
        }

        return report.Findings.Any(f => f.Severity >= Severity.Warning) ? ExitCodes.Findings : ExitCodes.Healthy;
    }

    private static (CsvPairExtract Current, CsvPairExtract? Baseline, ProfileLabels Labels) ReadFiles(ProfileRequest request, CancellationToken cancellationToken)
    {
        // The validator guarantees --x and --y with --csv.
        var xName = request.X!;
        var yName = request.Y!;
        try
        {
            var current = CsvPairReader.ReadFile(request.Csv!, xName, yName, cancellationToken);
            var baseline = request.BaselineCsv is null
                ? null
                : CsvPairReader.ReadFile(request.BaselineCsv, request.BaselineX ?? xName, request.BaselineY ?? yName, cancellationToken);
            return (current, baseline, new ProfileLabels(xName, yName, request.Csv!, request.BaselineCsv));
        }
        catch (SourceException ex)
        {
            throw new CliUsageException(ex.Message, ex);
        }
    }

    private static (CsvPairExtract Current, CsvPairExtract Baseline, ProfileLabels Labels) ReadBundledSample(CliConsole console, CancellationToken cancellationToken)
    {
        console.WriteNote(
            $"no --csv given: profiling the bundled sample (invented bakery data, {BundledSample.YColumn} against " +
            $"{BundledSample.XColumn}, current extract against a baseline); see 'driftwatch profile --help' for your own files.");
        using var currentText = BundledSample.Open(BundledSample.CurrentName);
        using var baselineText = BundledSample.Open(BundledSample.BaselineName);
        var current = CsvPairReader.Read(currentText, BundledSample.CurrentName, BundledSample.XColumn, BundledSample.YColumn, cancellationToken);
        var baseline = CsvPairReader.Read(baselineText, BundledSample.BaselineName, BundledSample.XColumn, BundledSample.YColumn, cancellationToken);
        var labels = new ProfileLabels(
            BundledSample.XColumn,
            BundledSample.YColumn,
            BundledSample.CurrentName + " (bundled sample)",
            BundledSample.BaselineName + " (bundled sample)");
        return (current, baseline, labels);
    }
}
