using System.Net;
using System.Net.Sockets;

namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>Loopback ports chosen at run time (the system hands out a free one), never fixed numbers.</summary>
public static class FreePort
{
    public static int Next()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }

    /// <summary>Returns once something accepts connections on the port, or throws after <paramref name="deadline"/>.</summary>
    public static Task WaitListeningAsync(int port, TimeSpan deadline) =>
        Eventually.TrueAsync($"something listening on 127.0.0.1:{port}", deadline, async ct =>
        {
            try
            {
                using var client = new TcpClient();
                await client.ConnectAsync(IPAddress.Loopback, port, ct);
                return true;
            }
            catch (SocketException)
            {
                return false;
            }
        });
}
