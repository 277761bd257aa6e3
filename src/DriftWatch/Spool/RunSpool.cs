using System.Globalization;
using DriftWatch.Core.History;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Spool;

/// <summary>
/// Runs the store could not take, kept on the local disk until it can: one file per run under <c>runs/</c>, named
/// by a sequence number so they are written to the store in the order they arrived. Every file is fsync'd before
/// it counts (<see cref="DurableFile"/>). Bounded by <see cref="SpoolOptions.MaxRuns"/> and
/// <see cref="SpoolOptions.MaxBytes"/>: a run that does not fit is refused, logged as an error and counted, and
/// the worker goes on. A file that cannot be read (truncated by a crash, edited) is moved to <c>unreadable/</c>
/// with a message naming it; the others are still written.
/// </summary>
internal sealed class RunSpool
{
    private const string Extension = ".json";

    private readonly SpoolOptions _options;
    private readonly ILogger<RunSpool> _logger;
    private readonly Lock _lock = new();
    private readonly SortedDictionary<long, long> _sizes = [];
    private bool _opened;
    private long _nextSequence = 1;
    private long _bytes;
    private bool _full;
    private long _dropped;
    private long _unreadable;

    public RunSpool(SpoolOptions options, ILogger<RunSpool> logger)
    {
        ArgumentNullException.ThrowIfNull(options);
        ArgumentNullException.ThrowIfNull(logger);
        _options = options;
        _logger = logger;
    }

    public SpoolOptions Options => _options;

    public string RunsDirectory => Path.Combine(_options.Directory, "runs");

    public string UnreadableDirectory => Path.Combine(_options.Directory, "unreadable");

    /// <summary>Runs waiting for the store.</summary>
    public int Count
    {
        get
        {
            lock (_lock)
            {
                Open();
                return _sizes.Count;
            }
        }
    }

    public SpoolStatus Status
    {
        get
        {
            lock (_lock)
            {
                Open();
                return new SpoolStatus(_options.Directory, _sizes.Count, _bytes, _options.MaxRuns, _options.MaxBytes, _full, _dropped, _unreadable);
            }
        }
    }

    /// <summary>Keeps <paramref name="run"/> durably; false (logged as an error) when it does not fit or cannot be written.</summary>
    public bool TryAppend(NewRun run)
    {
        ArgumentNullException.ThrowIfNull(run);
        var content = SpoolFileFormat.Encode(run);
        lock (_lock)
        {
            Open();
            if (_sizes.Count + 1 > _options.MaxRuns || _bytes + content.Length > _options.MaxBytes)
            {
                _full = true;
                _dropped++;
                _logger.LogError(
                    "SPOOL FULL: the run of {Pair} started {StartedAt:u} is LOST; the spool at {Spool} holds {Runs} runs, {Bytes} bytes (worker.spool max_runs {MaxRuns}, max_bytes {MaxBytes}) until the store is back",
                    run.Pair, run.StartedAt, _options.Directory, _sizes.Count, _bytes, _options.MaxRuns, _options.MaxBytes);
                return false;
            }

            var sequence = _nextSequence;
            try
            {
                DurableFile.Write(FileOf(sequence), content);
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                _dropped++;
                _logger.LogError(ex, "SPOOL WRITE FAILED: the run of {Pair} started {StartedAt:u} is LOST: {Error}", run.Pair, run.StartedAt, ex.Message);
                return false;
            }

            _nextSequence++;
            _sizes[sequence] = content.Length;
            _bytes += content.Length;
            _full = false;
            return true;
        }
    }

    /// <summary>
    /// The oldest run that can be read, or null when the spool is empty. Files that cannot be read on the way are
    /// moved to <c>unreadable/</c> with a warning naming the file and the fault.
    /// </summary>
    public SpoolEntry? Peek()
    {
        lock (_lock)
        {
            Open();
            while (_sizes.Count > 0)
            {
                var (sequence, size) = _sizes.First();
                var file = FileOf(sequence);
                try
                {
                    return new SpoolEntry(sequence, file, size, SpoolFileFormat.DecodeRun(File.ReadAllBytes(file)));
                }
                catch (Exception ex) when (ex is FormatException or IOException or UnauthorizedAccessException)
                {
                    SetAside(file, ex.Message);
                    Forget(sequence);
                }
            }

            return null;
        }
    }

    /// <summary>Deletes the entry once the store holds its run.</summary>
    public void Remove(SpoolEntry entry)
    {
        ArgumentNullException.ThrowIfNull(entry);
        lock (_lock)
        {
            File.Delete(entry.File);
            Forget(entry.Sequence);
        }
    }

    private void Forget(long sequence)
    {
        if (_sizes.Remove(sequence, out var size))
        {
            _bytes -= size;
        }
    }

    private string FileOf(long sequence) => Path.Combine(RunsDirectory, sequence.ToString("D12", CultureInfo.InvariantCulture) + Extension);

    /// <summary>Reads the folder once: what a previous process left, a synced <c>.tmp</c> whose rename was lost included.</summary>
    private void Open()
    {
        if (_opened)
        {
            return;
        }

        Directory.CreateDirectory(RunsDirectory);
        foreach (var temp in Directory.EnumerateFiles(RunsDirectory, "*" + Extension + DurableFile.TempSuffix))
        {
            var final = temp[..^DurableFile.TempSuffix.Length];
            try
            {
                SpoolFileFormat.DecodeRun(File.ReadAllBytes(temp));
                File.Move(temp, final, overwrite: true);
            }
            catch (Exception ex) when (ex is FormatException or IOException or UnauthorizedAccessException)
            {
                // Cut off while it was written: the run it held never counted as kept (TryAppend had not returned).
                SetAside(temp, ex.Message);
            }
        }

        foreach (var file in Directory.EnumerateFiles(RunsDirectory, "*" + Extension))
        {
            if (long.TryParse(Path.GetFileNameWithoutExtension(file), NumberStyles.None, CultureInfo.InvariantCulture, out var sequence))
            {
                var size = new FileInfo(file).Length;
                _sizes[sequence] = size;
                _bytes += size;
                _nextSequence = Math.Max(_nextSequence, sequence + 1);
            }
            else
            {
                SetAside(file, "not a spool file name (NNNNNNNNNNNN.json)");
            }
        }

        _opened = true;
        if (_sizes.Count > 0)
        {
            _logger.LogWarning("The spool at {Spool} holds {Runs} runs from before this start; they are written to the store in order as soon as it answers", _options.Directory, _sizes.Count);
        }
    }

    private void SetAside(string file, string reason)
    {
        _unreadable++;
        try
        {
            Directory.CreateDirectory(UnreadableDirectory);
            var target = Path.Combine(UnreadableDirectory, Path.GetFileName(file));
            File.Move(file, target, overwrite: true);
            _logger.LogWarning("Spool file {File} cannot be read and was moved to {Target}; its run is not written to the store: {Reason}", file, target, reason);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            _logger.LogWarning("Spool file {File} cannot be read ({Reason}) nor moved aside ({Error})", file, reason, ex.Message);
        }
    }
}
