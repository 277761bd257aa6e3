using System.Net;
using System.Net.Sockets;

namespace DriftWatch.IntegrationTests.Infrastructure;

/// <summary>
/// A loopback TCP relay in front of a real server, so a test can take the server away from the code under test
/// (<see cref="Cut"/>: the listener closes and every relayed connection is reset, as when a server stops) and give it
/// back (<see cref="Restore"/>: the same port listens again) without stopping a server other tests share.
/// </summary>
public sealed class TcpRelay : IAsyncDisposable
{
    private readonly IPEndPoint _target;
    private readonly List<TcpClient> _open = [];
    private readonly Lock _lock = new();
    private TcpListener? _listener;
    private CancellationTokenSource? _running;
    private Task? _accepting;

    public TcpRelay(string host, int port)
    {
        _target = new IPEndPoint(IPAddress.Parse(host == "localhost" ? "127.0.0.1" : host), port);
        Restore(0);
    }

    public int Port { get; private set; }

    public void Cut()
    {
        _running?.Cancel();
        _listener?.Stop();
        _listener = null;
        lock (_lock)
        {
            foreach (var client in _open)
            {
                // Linger 0: a reset, as the client would see from a server that went away.
                try
                {
                    client.Client?.LingerState = new LingerOption(true, 0);
                }
                catch (ObjectDisposedException)
                {
                    // Already closed by its pump.
                }

                client.Dispose();
            }

            _open.Clear();
        }
    }

    public void Restore() => Restore(Port);

    public async ValueTask DisposeAsync()
    {
        Cut();
        if (_accepting is not null)
        {
            await _accepting.ContinueWith(_ => { }, TaskScheduler.Default);
        }

        _running?.Dispose();
    }

    private void Restore(int port)
    {
        var listener = new TcpListener(IPAddress.Loopback, port);
        listener.Server.SetSocketOption(SocketOptionLevel.Socket, SocketOptionName.ReuseAddress, true);
        listener.Start();
        Port = ((IPEndPoint)listener.LocalEndpoint).Port;
        _listener = listener;
        _running?.Dispose();
        _running = new CancellationTokenSource();
        _accepting = AcceptAsync(listener, _running.Token);
    }

    private async Task AcceptAsync(TcpListener listener, CancellationToken cancellationToken)
    {
        while (!cancellationToken.IsCancellationRequested)
        {
            TcpClient inbound;
            try
            {
                inbound = await listener.AcceptTcpClientAsync(cancellationToken);
            }
            catch (Exception ex) when (ex is OperationCanceledException or SocketException or ObjectDisposedException)
            {
                return;
            }

            var outbound = new TcpClient();
            try
            {
                await outbound.ConnectAsync(_target, cancellationToken);
            }
            catch (Exception ex) when (ex is OperationCanceledException or SocketException)
            {
                inbound.Dispose();
                outbound.Dispose();
                continue;
            }

            lock (_lock)
            {
                _open.Add(inbound);
                _open.Add(outbound);
            }

            _ = PumpAsync(inbound, outbound, cancellationToken);
            _ = PumpAsync(outbound, inbound, cancellationToken);
        }
    }

    private static async Task PumpAsync(TcpClient from, TcpClient to, CancellationToken cancellationToken)
    {
        try
        {
            await from.GetStream().CopyToAsync(to.GetStream(), cancellationToken);
        }
        catch (Exception ex) when (ex is IOException or OperationCanceledException or ObjectDisposedException or SocketException or InvalidOperationException)
        {
            // The other side went, or the relay was cut.
        }
        finally
        {
            from.Dispose();
            to.Dispose();
        }
    }
}
