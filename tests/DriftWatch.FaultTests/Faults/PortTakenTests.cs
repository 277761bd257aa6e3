using System.Net;
using System.Net.Sockets;
using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>Something else already listens on the dashboard's port when the worker starts.</summary>
[Collection(UsesPostgres.Name)]
public sealed class PortTakenTests(PostgresServer server)
{
    [Fact]
    public async Task DashboardPortTaken_OneLineAndExitCodeTwo_NoCheckRuns()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        using var squatter = new TcpListener(IPAddress.Loopback, bench.DashboardPort);
        squatter.Start();
        bench.WriteConfig(new WorkerSetup { Pairs = [new PairSpec("km-vs-litres", FaultBench.SourceTable)] });

        var worker = bench.StartProcess();

        // 2 is the documented exit code for a usage or configuration error (docs, Cli/ExitCodes.cs).
        Assert.Equal(2, await worker.WaitForExitAsync(Eventually.Deadline));
        var line = Assert.Single(worker.Output, l => !string.IsNullOrWhiteSpace(l));
        Assert.Contains(bench.DashboardPort.ToString(System.Globalization.CultureInfo.InvariantCulture), line, StringComparison.Ordinal);
        Assert.Equal(0, await bench.Store.ScalarAsync<long>("SELECT count(*) FROM pg_tables WHERE tablename = 'runs'"));
    }
}
