using System.Net;
using System.Net.Sockets;
using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard;
using DriftWatch.Tests.Cli;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.Extensions.DependencyInjection;

namespace DriftWatch.Tests.Dashboard.Access;

/// <summary>
/// What the dashboard really binds, checked on the server's own bound addresses and by connecting: ::1 is the
/// IPv6 loopback address and 127.0.0.1 the IPv4 one (RFC 4291 section 2.5.3, RFC 1122 section 3.2.1.3);
/// ::ffff:a.b.c.d is the IPv4-mapped form of a.b.c.d (RFC 4291 section 2.5.5.2).
/// </summary>
public sealed class BindingTests
{
    [Theory]
    [InlineData("::1")]
    [InlineData("[::1]")]
    public async Task Dashboard_BoundToIpv6Loopback_ListensOnThatAddressOnly(string bind)
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var server = await DashboardServer.StartAsync(Options(scenario, new DashboardConfig { Bind = bind, Port = 0 }), CancellationToken.None);

        var bound = server.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses;
        var address = Assert.Single(bound);
        Assert.StartsWith("http://[::1]:", address, StringComparison.Ordinal);
        var port = new Uri(address).Port;

        // Reachable on ::1 without a token (loopback), and on no IPv4 address of this machine.
        using var client = new HttpClient { BaseAddress = new Uri($"http://[::1]:{port}/") };
        Assert.Equal(HttpStatusCode.OK, (await client.GetAsync(new Uri("api/pairs", UriKind.Relative))).StatusCode);
        var refused = await Assert.ThrowsAsync<SocketException>(() => ConnectAsync(IPAddress.Loopback, port));
        Assert.Equal(SocketError.ConnectionRefused, refused.SocketErrorCode);
    }

    [Fact]
    public async Task Dashboard_BoundToIpv4MappedLoopback_ListensOnIpv4LoopbackWithoutToken()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        var dashboard = new DashboardConfig { Bind = "::ffff:127.0.0.1", Port = 0 };
        await using var server = await DashboardServer.StartAsync(Options(scenario, dashboard), CancellationToken.None);

        var address = Assert.Single(server.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses);
        Assert.StartsWith("http://127.0.0.1:", address, StringComparison.Ordinal);
        using var client = new HttpClient { BaseAddress = new Uri(address) };
        Assert.Equal(HttpStatusCode.OK, (await client.GetAsync(new Uri("/api/pairs", UriKind.Relative))).StatusCode);
    }

    [Fact]
    public async Task Run_DashboardPortTaken_IsOneLineNamingAddressAndPort_Exit2()
    {
        using var taken = new TcpListener(IPAddress.Loopback, 0);
        taken.Start();
        var port = ((IPEndPoint)taken.LocalEndpoint).Port;
        using var dir = new Configuration.TempDirectory();
        var config = dir.Write("driftwatch.yaml", $"""
            sources:
              - name: shop
                kind: sqlite
                connection: shop.db
            store:
              kind: sqlite
              connection: store.db
            pairs:
              - name: items-vs-total
                source: shop
                table: orders
                x: items
                y: total
            dashboard:
              bind: 127.0.0.1
              port: {port}
            """);

        var run = await CliRun.Of("run", "--config", config);

        Assert.Equal(2, run.ExitCode);
        Assert.Equal($"error: cannot serve the dashboard on 127.0.0.1 port {port}: the port is already in use (dashboard.bind, dashboard.port)", run.Error.TrimEnd());
        // Refused before anything started: no store was created.
        Assert.False(File.Exists(Path.Combine(dir.Path, "store.db")));
    }

    [Fact]
    public void Probe_AddressNotOnThisMachine_IsOneLineNamingAddressAndPort()
    {
        // 192.0.2.0/24 is TEST-NET-1, reserved for documentation (RFC 5737): never assigned to this machine.
        var problem = DashboardBinding.Probe(new IPEndPoint(IPAddress.Parse("192.0.2.10"), 8087));
        Assert.NotNull(problem);
        Assert.StartsWith("cannot serve the dashboard on 192.0.2.10 port 8087: ", problem, StringComparison.Ordinal);
        Assert.DoesNotContain('\n', problem);
    }

    private static DashboardServerOptions Options(DashboardScenario scenario, DashboardConfig dashboard) =>
        new(scenario.Config with { Dashboard = dashboard }, scenario.Database, scenario.History, scenario.Alerts)
        {
            Time = DashboardScenario.Clock,
            Logging = _ => { },
        };

    private static async Task ConnectAsync(IPAddress address, int port)
    {
        using var socket = new Socket(address.AddressFamily, SocketType.Stream, ProtocolType.Tcp);
        await socket.ConnectAsync(new IPEndPoint(address, port));
    }
}
