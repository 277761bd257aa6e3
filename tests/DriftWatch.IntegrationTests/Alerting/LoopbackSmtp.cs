using System.Net;
using System.Net.Sockets;
using MimeKit;
using netDumbster.smtp;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>A real SMTP server (netDumbster) on the loopback interface, and the messages it received, parsed by MimeKit.</summary>
internal static class LoopbackSmtp
{
    public static SimpleSmtpServer Start(int? port = null)
    {
        var configuration = netDumbster.smtp.Configuration.Configure().WithAddress(IPAddress.Loopback);
        configuration = port is null ? configuration.WithRandomPort() : configuration.WithPort(port.Value);
        return configuration.Build();
    }

    public static int Port(SimpleSmtpServer server) => server.Configuration.Port;

    /// <summary>A loopback port nobody listens on right now (bound, read, released).</summary>
    public static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        var port = ((IPEndPoint)listener.LocalEndpoint).Port;
        listener.Stop();
        return port;
    }

    public static IReadOnlyList<MimeMessage> Received(SimpleSmtpServer server) =>
        [.. server.ReceivedEmail.Select(m => MimeMessage.Load(new MemoryStream(System.Text.Encoding.UTF8.GetBytes(m.Data))))];

    /// <summary>netDumbster records a message after the SMTP dialogue ends; wait (bounded) for the count to arrive.</summary>
    public static async Task<IReadOnlyList<MimeMessage>> WaitForAsync(SimpleSmtpServer server, int count)
    {
        for (var i = 0; i < 100 && server.ReceivedEmail.Length < count; i++)
        {
            await Task.Delay(50);
        }

        return Received(server);
    }
}
