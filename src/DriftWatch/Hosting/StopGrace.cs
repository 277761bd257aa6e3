using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Hosting;

/// <summary>
/// The grace running checks get when the worker is asked to stop (SIGTERM, Ctrl+C): <see cref="Expired"/> is
/// cancelled <see cref="Grace"/> after the host starts stopping. Scheduled checks link their token to it, so a
/// check that finishes in time is recorded as it ended, and one that does not is cancelled and recorded as
/// cancelled. The host's own shutdown timeout is the grace plus <see cref="RecordMargin"/>, so the host never
/// gives up on a check before that check has written its record.
/// </summary>
internal sealed class StopGrace : IDisposable
{
    /// <summary>Time for a cancelled check to write its run (one short store transaction) after the grace ran out.</summary>
    public static readonly TimeSpan RecordMargin = TimeSpan.FromSeconds(10);

    private readonly CancellationTokenSource _expired = new();
    private readonly CancellationTokenRegistration _stopping;

    public StopGrace(TimeSpan grace, IHostApplicationLifetime lifetime, ILogger<StopGrace> logger)
    {
        ArgumentNullException.ThrowIfNull(lifetime);
        ArgumentNullException.ThrowIfNull(logger);
        Grace = grace;
        _stopping = lifetime.ApplicationStopping.Register(() =>
        {
            logger.LogInformation("Stopping: running checks have {Grace} to finish, then they are cancelled and recorded as cancelled", grace);
            // Wall time of the process, not the scheduler's clock: a stop is a matter of the operating system.
            _expired.CancelAfter(grace);
        });
    }

    public TimeSpan Grace { get; }

    /// <summary>Cancelled once the grace after a stop request has run out.</summary>
    public CancellationToken Expired => _expired.Token;

    /// <summary>How long the host waits for its services to stop.</summary>
    public static TimeSpan HostShutdownTimeout(TimeSpan grace) => grace + RecordMargin;

    public void Dispose()
    {
        _stopping.Dispose();
        _expired.Dispose();
    }
}
