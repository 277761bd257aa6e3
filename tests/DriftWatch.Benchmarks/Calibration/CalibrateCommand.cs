using DriftWatch.Calibration.Reporting;
using DriftWatch.Calibration.Running;

namespace DriftWatch.Benchmarks.Calibration;

/// <summary>
/// <c>dotnet run -c Release --project tests/DriftWatch.Benchmarks -- calibrate [--quick] [--json FILE] …</c>:
/// the calibration suite (tests/DriftWatch.Calibration) in full; the report goes to stdout, progress to stderr.
/// </summary>
/// <remarks>
/// A figure of merit of the statistics rather than a speed benchmark: false findings and confirmed alerts per 1,000
/// healthy pair-checks and the share of faults caught within two checks, against the bar of issue 9. Exit code
/// 0 whether or not the bar is met (the report says), 2 for bad options.
/// </remarks>
internal static class CalibrateCommand
{
    public const string Name = "calibrate";

    public static Task<int> RunAsync(string[] args) => CalibrationOptions.Command(RunAsync).Parse(args).InvokeAsync();

    private static async Task<int> RunAsync(CalibrationOptions options, CancellationToken ct)
    {
        if (options.Problems() is { Count: > 0 } problems)
        {
            foreach (var problem in problems)
            {
                await Console.Error.WriteLineAsync(problem);
            }

            return 2;
        }

        var run = await new CalibrationRunner(Console.Error).RunAsync(options, ct);
        await Console.Out.WriteAsync(run.Report);
        if (options.JsonPath is { } path)
        {
            await File.WriteAllTextAsync(path, CalibrationReport.Json(run.Results), ct);
            await Console.Error.WriteLineAsync($"JSON written to {path}");
        }

        return 0;
    }
}
