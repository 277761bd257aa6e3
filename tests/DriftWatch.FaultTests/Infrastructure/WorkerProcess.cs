using System.Collections.Concurrent;
using System.Diagnostics;
using System.Globalization;

namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>
/// <c>driftwatch run</c> as a real process: <c>dotnet exec</c> of the driftwatch.dll the build copied beside the tests.
/// Its output is kept line by line; it can be stopped with SIGTERM (as a supervisor does) or SIGKILL (a crash).
/// </summary>
public sealed class WorkerProcess : IDisposable
{
    private readonly Process _process;
    private readonly ConcurrentQueue<string> _output = new();
    private bool _disposed;

    private WorkerProcess(Process process)
    {
        _process = process;
        _process.OutputDataReceived += (_, e) => Keep(e.Data);
        _process.ErrorDataReceived += (_, e) => Keep(e.Data);
        _process.BeginOutputReadLine();
        _process.BeginErrorReadLine();
    }

    public int Id => _process.Id;

    public bool HasExited => _process.HasExited;

    /// <summary>Everything the process wrote to standard output and error so far.</summary>
    public IReadOnlyList<string> Output => [.. _output];

    public static WorkerProcess Start(string configPath, params string[] command) => Start(configPath, null, command);

    /// <summary>What a worker of a shared-schedule bench reads from its environment (see <see cref="WorkerSetup.Shared"/>).</summary>
    public static IReadOnlyDictionary<string, string> SharedEnvironment(string workerId, int dashboardPort, string spoolFolder) =>
        new Dictionary<string, string>
        {
            ["DW_TEST_WORKER"] = workerId,
            ["DW_TEST_PORT"] = dashboardPort.ToString(CultureInfo.InvariantCulture),
            ["DW_TEST_SPOOL"] = spoolFolder,
        };

    public static WorkerProcess Start(string configPath, IReadOnlyDictionary<string, string>? environment, params string[] command)
    {
        var dll = Path.Combine(AppContext.BaseDirectory, "driftwatch.dll");
        var info = new ProcessStartInfo("dotnet")
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
            WorkingDirectory = Path.GetDirectoryName(configPath)!,
        };
        foreach (var (name, value) in environment ?? new Dictionary<string, string>())
        {
            info.Environment[name] = value;
        }

        foreach (var arg in (string[])["exec", dll, .. (command.Length == 0 ? ["run"] : command), "--config", configPath])
        {
            info.ArgumentList.Add(arg);
        }

        return new WorkerProcess(Process.Start(info) ?? throw new InvalidOperationException("could not start dotnet"));
    }

    /// <summary>SIGTERM through kill(1): <see cref="Process.Kill()"/> would send SIGKILL.</summary>
    public async Task TerminateAsync()
    {
        using var kill = Process.Start("/bin/kill", ["-TERM", _process.Id.ToString(CultureInfo.InvariantCulture)]);
        await kill.WaitForExitAsync();
        if (kill.ExitCode != 0)
        {
            throw new InvalidOperationException($"kill -TERM {_process.Id} exited {kill.ExitCode}");
        }
    }

    /// <summary>SIGKILL: the process gets no chance to record, release or flush anything.</summary>
    public async Task KillHardAsync()
    {
        _process.Kill(entireProcessTree: true);
        await _process.WaitForExitAsync();
    }

    public async Task<int> WaitForExitAsync(TimeSpan deadline)
    {
        using var limit = new CancellationTokenSource(deadline);
        try
        {
            await _process.WaitForExitAsync(limit.Token);
        }
        catch (OperationCanceledException)
        {
            throw new TimeoutException($"The worker did not exit within {deadline.TotalSeconds:0} s.\n{OutputLog()}");
        }

        return _process.ExitCode;
    }

    public string OutputLog() => "--- worker output ---\n" + string.Join('\n', _output);

    /// <summary>Kills the process if it still runs. Safe to call twice (the test and the bench both dispose it).</summary>
    public void Dispose()
    {
        if (_disposed)
        {
            return;
        }

        _disposed = true;
        if (!_process.HasExited)
        {
            _process.Kill(entireProcessTree: true);
            _process.WaitForExit();
        }

        _process.Dispose();
    }

    private void Keep(string? line)
    {
        if (line is not null)
        {
            _output.Enqueue(line);
        }
    }
}
