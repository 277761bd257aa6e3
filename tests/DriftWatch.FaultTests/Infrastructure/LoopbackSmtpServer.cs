using System.Buffers;
using System.Collections.Concurrent;
using System.Net;
using System.Security.Cryptography.X509Certificates;
using MimeKit;
using SmtpServer;
using SmtpServer.Protocol;
using SmtpServer.Storage;

namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>
/// A real SMTP server (the SmtpServer package) on a loopback port chosen at run time: plain, STARTTLS (a certificate,
/// like port 587) or implicit TLS (like 465). It can be stopped and started again on the same port, and keeps every
/// message it accepted across restarts.
/// </summary>
public sealed class LoopbackSmtpServer : IAsyncDisposable
{
    private readonly ConcurrentQueue<MimeMessage> _received = new();
    private readonly X509Certificate2? _certificate;
    private readonly bool _implicitTls;
    private CancellationTokenSource? _running;
    private Task? _serving;

    private LoopbackSmtpServer(int port, X509Certificate2? certificate, bool implicitTls)
    {
        Port = port;
        _certificate = certificate;
        _implicitTls = implicitTls;
    }

    public int Port { get; }

    public IReadOnlyList<MimeMessage> Received => [.. _received];

    /// <summary>Message-Ids of every accepted message, one entry per delivery (a duplicate shows twice).</summary>
    public IReadOnlyList<string> ReceivedIds => [.. _received.Select(m => m.MessageId ?? "(no Message-Id)")];

    /// <summary>Starts a server; <paramref name="certificate"/> alone offers STARTTLS, with <paramref name="implicitTls"/> the connection is TLS from the start.</summary>
    public static async Task<LoopbackSmtpServer> StartAsync(X509Certificate2? certificate = null, bool implicitTls = false)
    {
        var server = new LoopbackSmtpServer(FreePort.Next(), certificate, implicitTls);
        await server.StartAgainAsync();
        return server;
    }

    /// <summary>Listens again on the same port after <see cref="StopAsync"/>.</summary>
    public async Task StartAgainAsync()
    {
        var options = new SmtpServerOptionsBuilder()
            .ServerName("localhost")
            .Endpoint(e =>
            {
                e.Endpoint(new IPEndPoint(IPAddress.Loopback, Port)).IsSecure(_implicitTls);
                if (_certificate is not null)
                {
                    e.Certificate(_certificate);
                }
            })
            .Build();
        var services = new SmtpServer.ComponentModel.ServiceProvider();
        services.Add(new Store(_received));
        _running = new CancellationTokenSource();
        var server = new SmtpServer.SmtpServer(options, services);
        _serving = server.StartAsync(_running.Token);
        // Serving once a client is greeted: wait for the listener rather than for a fixed time.
        await FreePort.WaitListeningAsync(Port, TimeSpan.FromSeconds(30));
    }

    /// <summary>Stops listening and drops open sessions: clients now get "connection refused".</summary>
    public async Task StopAsync()
    {
        if (_running is null)
        {
            return;
        }

        await _running.CancelAsync();
        try
        {
            await _serving!;
        }
        catch (OperationCanceledException)
        {
            // The way it stops.
        }

        _running.Dispose();
        _running = null;
    }

    public async ValueTask DisposeAsync() => await StopAsync();

    private sealed class Store(ConcurrentQueue<MimeMessage> received) : MessageStore
    {
        public override Task<SmtpResponse> SaveAsync(ISessionContext context, IMessageTransaction transaction, ReadOnlySequence<byte> buffer, CancellationToken cancellationToken)
        {
            using var stream = new MemoryStream(buffer.ToArray());
            received.Enqueue(MimeMessage.Load(stream, cancellationToken));
            return Task.FromResult(SmtpResponse.Ok);
        }
    }
}
