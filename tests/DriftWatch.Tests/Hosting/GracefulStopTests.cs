using System.Diagnostics;
using DriftWatch.Core.History;
using DriftWatch.Store;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Tests.Hosting;

/// <summary>
/// <c>driftwatch run</c> as a real process (dotnet exec of the built driftwatch.dll) stopped by SIGTERM while a
/// check is running: the check gets the configured grace (3 s here:
/// longer than the two seconds after which the command-line library used to end the process), is then cancelled, its run is recorded as
/// cancelled, and the process exits 0 (not 143, the shell's code for "killed by SIGTERM": 128 + 15, common practice).
/// </summary>
public sealed class GracefulStopTests : IDisposable
{
    /// <summary>How long the process may take for anything at all; a bound against a hung test, not a timing assertion.</summary>
    private static readonly TimeSpan Deadline = TimeSpan.FromSeconds(60);

    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-stop-" + Guid.NewGuid().ToString("N"));

    public GracefulStopTests() => Directory.CreateDirectory(_folder);

    [Fact]
    public async Task Run_SigTermDuringASlowCheck_CancelsItAfterTheGrace_RecordsTheRunAndExitsZero()
    {
        CreateSource(Path.Combine(_folder, "lab.db"));
        // The query counts to 400 million in a recursive CTE before it returns its rows: far longer than the test
        // waits, so only the stop can end it (sqlite3_interrupt, wired to the check's token).
        var config = Path.Combine(_folder, "driftwatch.yaml");
        File.WriteAllText(config, """
            sources:
              - name: lab
                kind: sqlite
                connection: lab.db
                statement_timeout: 10m
            store:
              kind: sqlite
              connection: store.db
            pairs:
              - name: slow
                source: lab
                query: "WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n WHERE i < 400000000) SELECT a, b FROM t CROSS JOIN (SELECT max(i) AS m FROM n) AS pause"
                x: a
                y: b
                schedule: "* * * * * ?"
            dashboard:
              enabled: false
            logging:
              level: debug
            worker:
              stop_grace: 3s
            """);

        using var process = Start(config);
        var started = new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously);
        var output = new System.Collections.Concurrent.ConcurrentQueue<string>();
        process.OutputDataReceived += (_, e) => Seen(e.Data);
        process.ErrorDataReceived += (_, e) => Seen(e.Data);
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        try
        {
            // The debug line PairCheckJob writes as the check begins.
            await started.Task.WaitAsync(Deadline);
            Assert.Equal(0, await TerminateAsync(process.Id));
            using var wait = new CancellationTokenSource(Deadline);
            await process.WaitForExitAsync(wait.Token);
        }
        finally
        {
            if (!process.HasExited)
            {
                process.Kill(entireProcessTree: true);
            }
        }

        Assert.True(process.ExitCode == 0, $"exit code {process.ExitCode}; output:\n{string.Join('\n', output)}");
        Assert.Contains(output, l => l.Contains("Stopping: running checks have 00:00:03 to finish", StringComparison.Ordinal));
        var run = Assert.Single(await RunsAsync(Path.Combine(_folder, "store.db")));
        Assert.Equal("slow", run.Pair);
        Assert.Equal(RunStatus.Failed, run.Status);
        Assert.Equal("check cancelled before it finished (shutdown)", run.Error);

        void Seen(string? line)
        {
            if (line is null)
            {
                return;
            }

            output.Enqueue(line);
            if (line.Contains("Check of slow started", StringComparison.Ordinal))
            {
                started.TrySetResult();
            }
        }
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(_folder, recursive: true);
    }

    private static Process Start(string config)
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

        return Process.Start(info) ?? throw new InvalidOperationException("could not start dotnet");
    }

    private static void CreateSource(string path)
    {
        using var connection = new SqliteConnection($"Data Source={path}");
        connection.Open();
        using var command = connection.CreateCommand();
        // Anscombe's quartet, set I (Anscombe 1973; values from memory): any valid pair will do, the query's delay is the point.
        command.CommandText = """
            CREATE TABLE t (a REAL, b REAL);
            INSERT INTO t VALUES (10, 8.04), (8, 6.95), (13, 7.58), (9, 8.81), (11, 8.33), (14, 9.96),
                                 (6, 7.24), (4, 4.26), (12, 10.84), (7, 4.82), (5, 5.68);
            """;
        command.ExecuteNonQuery();
    }

    private static async Task<IReadOnlyList<RunRecord>> RunsAsync(string storePath)
    {
        var database = new SqliteStoreDatabase($"Data Source={storePath}");
        var store = StoreFactory.CreateHistoryStore(database, new DriftWatch.Core.Configuration.StoreConfig());
        return await store.GetRunsAsync("slow", 10, includePoints: false, CancellationToken.None);
    }

    /// <summary>Sends SIGTERM with the system's kill(1); <see cref="Process.Kill()"/> would send SIGKILL.</summary>
    private static async Task<int> TerminateAsync(int pid)
    {
        using var kill = Process.Start("/bin/kill", ["-TERM", pid.ToString(System.Globalization.CultureInfo.InvariantCulture)]);
        await kill.WaitForExitAsync();
        return kill.ExitCode;
    }
}
