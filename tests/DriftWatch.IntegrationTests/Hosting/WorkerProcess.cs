using System.Collections.Concurrent;
using System.Diagnostics;
using Microsoft.Data.Sqlite;

namespace DriftWatch.IntegrationTests.Hosting;

/// <summary>
/// <c>driftwatch run</c> as a real process (dotnet exec of the built driftwatch.dll), its log lines kept, stopped
/// by SIGTERM (kill(1)) or killed outright (SIGKILL, a crash as far as the worker can tell).
/// </summary>
internal sealed class WorkerProcess : IDisposable
{
    /// <summary>A bound against a hung test, not a timing assertion.</summary>
    public static readonly TimeSpan Deadline = TimeSpan.FromSeconds(90);

    private readonly Process _process;
    private readonly ConcurrentQueue<string> _lines = new();
    private readonly ConcurrentDictionary<string, TaskCompletionSource> _waits = new();

    private WorkerProcess(Process process) => _process = process;

    public IReadOnlyCollection<string> Lines => _lines;

    public string Output => string.Join('\n', _lines);

    public static WorkerProcess Start(string config)
    {
        var dll = Path.Combine(AppContext.BaseDirectory, "driftwatch.dll");
        var info = new ProcessStartInfo("dotnet")
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
            WorkingDirectory = Path.GetDirectoryName(config)!,
        };
        foreach (var arg in new[] { "exec", dll, "run", "--config", config })
        {
            info.ArgumentList.Add(arg);
        }

        var worker = new WorkerProcess(Process.Start(info) ?? throw new InvalidOperationException("could not start dotnet"));
        worker._process.OutputDataReceived += (_, e) => worker.Seen(e.Data);
        worker._process.ErrorDataReceived += (_, e) => worker.Seen(e.Data);
        worker._process.BeginOutputReadLine();
        worker._process.BeginErrorReadLine();
        return worker;
    }

    /// <summary>Completes when a log line containing <paramref name="text"/> appears (from now on or already seen).</summary>
    public async Task WaitForLineAsync(string text)
    {
        var wait = _waits.GetOrAdd(text, _ => new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously));
        if (_lines.Any(l => l.Contains(text, StringComparison.Ordinal)))
        {
            wait.TrySetResult();
        }

        try
        {
            await wait.Task.WaitAsync(Deadline);
        }
        catch (TimeoutException)
        {
            Assert.Fail($"no log line with '{text}'; output:\n{Output}");
        }
    }

    public void Kill()
    {
        _process.Kill(entireProcessTree: true);
        _process.WaitForExit();
    }

    /// <summary>SIGTERM, then waits for the exit; returns the exit code.</summary>
    public async Task<int> StopAsync()
    {
        using (var kill = Process.Start("/bin/kill", ["-TERM", _process.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)]))
        {
            await kill.WaitForExitAsync();
        }

        using var wait = new CancellationTokenSource(Deadline);
        await _process.WaitForExitAsync(wait.Token);
        return _process.ExitCode;
    }

    public void Dispose()
    {
        if (!_process.HasExited)
        {
            _process.Kill(entireProcessTree: true);
        }

        _process.Dispose();
    }

    /// <summary>Anscombe's quartet, set I (Anscombe 1973; values from memory) in table t(a, b): any valid pair will do.</summary>
    public static void CreateSource(string path)
    {
        using var connection = new SqliteConnection($"Data Source={path}");
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = """
            CREATE TABLE t (a REAL, b REAL);
            INSERT INTO t VALUES (10, 8.04), (8, 6.95), (13, 7.58), (9, 8.81), (11, 8.33), (14, 9.96),
                                 (6, 7.24), (4, 4.26), (12, 10.84), (7, 4.82), (5, 5.68);
            """;
        command.ExecuteNonQuery();
    }

    private void Seen(string? line)
    {
        if (line is null)
        {
            return;
        }

        _lines.Enqueue(line);
        foreach (var (text, wait) in _waits)
        {
            if (line.Contains(text, StringComparison.Ordinal))
            {
                wait.TrySetResult();
            }
        }
    }
}
