using DriftWatch.Calibration.Running;

namespace DriftWatch.Tests.Calibration;

/// <summary>One quick calibration run (about half a minute) shared by every assertion of the class.</summary>
public sealed class QuickCalibrationFixture : IAsyncLifetime
{
    internal CalibrationRun Run { get; private set; } = null!;

    internal string Progress { get; private set; } = string.Empty;

    public async Task InitializeAsync()
    {
        using var progress = new StringWriter();
        Run = await new CalibrationRunner(progress).RunAsync(CalibrationOptions.QuickPreset, CancellationToken.None);
        Progress = progress.ToString();
    }

    public Task DisposeAsync() => Task.CompletedTask;
}
