using System.Runtime.InteropServices;
using DriftWatch.Configuration;
using DriftWatch.Scheduling;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Quartz;

namespace DriftWatch.Hosting;

/// <summary>
/// Reloads the worker's configuration file: on SIGHUP, when the file changes (a watcher on its folder, so editors
/// that write a new file and rename it over the old one are seen too; events within <see cref="Debounce"/> make one
/// reload), and by comparing the file's hash every <see cref="PollEvery"/> (file systems that send no events). A
/// valid file is applied (<see cref="ConfigChanges"/>); an invalid one is logged, error by error, and the worker
/// keeps the configuration it has.
/// </summary>
internal sealed class ConfigReloadService(LiveConfig live, ISchedulerFactory schedulers, TimeProvider time, ILogger<ConfigReloadService> logger) : BackgroundService
{
    public static readonly TimeSpan Debounce = TimeSpan.FromMilliseconds(500);

    public static readonly TimeSpan PollEvery = TimeSpan.FromSeconds(5);

    private readonly SemaphoreSlim _signal = new(0, int.MaxValue);
    private readonly Lock _lock = new();
    private FileSystemWatcher? _watcher;
    private PosixSignalRegistration? _hangup;
    private ITimer? _debounce;
    private volatile bool _forced;

    /// <summary>The hash of the last text read (applied or refused): an unchanged file is not reloaded again.</summary>
    private string? _lastSeen;

    public override async Task StartAsync(CancellationToken cancellationToken)
    {
        _lastSeen = live.Status.Sha256;
        if (live.Current.FilePath is { } file && Path.GetDirectoryName(file) is { } folder)
        {
            try
            {
                _watcher = new FileSystemWatcher(folder, Path.GetFileName(file))
                {
                    NotifyFilter = NotifyFilters.LastWrite | NotifyFilters.FileName | NotifyFilters.Size | NotifyFilters.CreationTime,
                };
                _watcher.Changed += (_, _) => Soon();
                _watcher.Created += (_, _) => Soon();
                _watcher.Renamed += (_, _) => Soon();
                _watcher.EnableRaisingEvents = true;
            }
            catch (Exception ex) when (ex is IOException or ArgumentException or PlatformNotSupportedException)
            {
                // No events (inotify limit reached, say): the poll still sees every change.
                logger.LogWarning("Not watching {File} for changes ({Error}); it is read again every {Poll}", file, ex.Message, PollEvery);
            }
        }

        if (!OperatingSystem.IsWindows())
        {
            _hangup = PosixSignalRegistration.Create(PosixSignal.SIGHUP, context =>
            {
                // Handled here: the default action of SIGHUP would end the process.
                context.Cancel = true;
                _forced = true;
                _signal.Release();
            });
        }

        await base.StartAsync(cancellationToken);
    }

    public override async Task StopAsync(CancellationToken cancellationToken)
    {
        _hangup?.Dispose();
        _watcher?.Dispose();
        await base.StopAsync(cancellationToken);
    }

    public override void Dispose()
    {
        _hangup?.Dispose();
        _watcher?.Dispose();
        _debounce?.Dispose();
        _signal.Dispose();
        base.Dispose();
    }

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        try
        {
            while (!stoppingToken.IsCancellationRequested)
            {
                // A signal (SIGHUP, or a file event after its debounce) or the poll interval, whichever comes first.
                // Wall time of the process: how often a file is looked at is not a matter of the scheduler's clock.
                await _signal.WaitAsync(PollEvery, stoppingToken);
                var forced = _forced;
                _forced = false;
                try
                {
                    await ReloadAsync(forced ? "SIGHUP" : "file change", forced, stoppingToken);
                }
                catch (Exception ex) when (ex is not OperationCanceledException)
                {
                    // A reload must never stop the worker: the fault is reported like a refused file.
                    logger.LogError(ex, "Reload failed: {Error}; the configuration in force is kept as far as it was applied", ex.Message);
                    live.Reject(new ReloadError(time.GetUtcNow(), [$"internal error: {ex.GetType().Name}: {ex.Message}"]));
                }
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
            // Stopping.
        }
    }

    /// <summary>Reads the file and applies it when it changed (always on SIGHUP); never throws for a bad file.</summary>
    internal async Task ReloadAsync(string reason, bool force, CancellationToken cancellationToken)
    {
        var file = live.Current.FilePath;
        if (file is null)
        {
            return;
        }

        string text;
        try
        {
            text = await File.ReadAllTextAsync(file, cancellationToken);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            // Mid-replacement by an editor, or gone: the next event or poll tries again; the worker keeps its configuration.
            if (force)
            {
                logger.LogWarning("Reload ({Reason}): cannot read {File}: {Error}; the configuration in force is kept", reason, file, ex.Message);
            }

            return;
        }

        var hash = LiveConfig.Hash(text);
        if (!force && hash == _lastSeen)
        {
            return;
        }

        _lastSeen = hash;
        var loaded = ConfigLoader.Load(file, Environment.GetEnvironmentVariable);
        var now = time.GetUtcNow();
        if (!loaded.Ok)
        {
            foreach (var error in loaded.Errors)
            {
                logger.LogError("Reload ({Reason}) refused: {Error}", reason, error.ToString());
            }

            logger.LogError("Reload ({Reason}) refused: {Count} errors in {File}; the worker keeps the configuration loaded {LoadedAt:u}", reason, loaded.Errors.Count, file, live.Status.LoadedAt);
            live.Reject(ReloadError.From(now, loaded.Errors));
            return;
        }

        var current = live.Current;
        var changes = ConfigChanges.Between(current, loaded.Config!);
        var scheduler = await schedulers.GetScheduler(cancellationToken);
        // The configuration goes in force before the schedule changes, so a pair added is known when its job first runs.
        live.Apply(ConfigChanges.Effective(current, loaded.Config!), hash, now);
        await PairSchedules.ApplyAsync(scheduler, changes, logger, cancellationToken, shared: current.Worker.SharedSchedule);
        logger.LogInformation("Reload ({Reason}): configuration {Hash} in force ({Pairs} pairs){Nothing}", reason, hash[..12], loaded.Config!.Pairs.Count, changes.IsEmpty ? ", nothing changed" : string.Empty);
    }

    private void Soon()
    {
        lock (_lock)
        {
            // Editors write a file in several steps: the last event within the debounce starts one reload.
            _debounce ??= time.CreateTimer(_ => _signal.Release(), null, Timeout.InfiniteTimeSpan, Timeout.InfiniteTimeSpan);
            _debounce.Change(Debounce, Timeout.InfiniteTimeSpan);
        }
    }
}
