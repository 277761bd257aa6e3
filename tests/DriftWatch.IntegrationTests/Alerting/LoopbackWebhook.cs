using System.Net;
using System.Net.Sockets;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>One post as the receiver saw it, and the status it answered with.</summary>
internal sealed record ReceivedPost(string? Timestamp, string? Signature, string? DeliveryId, string? ContentType, string Method, byte[] Body, int Answered);

/// <summary>
/// A real HTTP receiver on 127.0.0.1 (the framework's HttpListener, no mock): records every request before it answers,
/// so when the dispatcher has its answer the post is already recorded. Answers 200 unless told otherwise with
/// <see cref="AnswerNext"/>, one scripted status per request. Also compiled into the fault tests (linked source).
/// </summary>
internal sealed class LoopbackWebhook : IDisposable
{
    private readonly HttpListener _listener = new();
    private readonly Queue<(int Status, string Body, string? RetryAfter)> _script = new();
    private readonly List<ReceivedPost> _received = [];
    private readonly Task _loop;

    private LoopbackWebhook(int port)
    {
        Port = port;
        _listener.Prefixes.Add($"http://127.0.0.1:{port}/");
        _listener.Start();
        _loop = Task.Run(ServeAsync);
    }

    public int Port { get; }

    public Uri Url => new($"http://127.0.0.1:{Port}/hooks/driftwatch");

    public IReadOnlyList<ReceivedPost> Received
    {
        get
        {
            lock (_received)
            {
                return [.. _received];
            }
        }
    }

    public static LoopbackWebhook Start(int? port = null) => new(port ?? FreePort());

    /// <summary>A port nothing listens on right now: a receiver that is down refuses connections there.</summary>
    public static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        var port = ((IPEndPoint)listener.LocalEndpoint).Port;
        listener.Stop();
        return port;
    }

    /// <summary>The next requests get these statuses, in order (then 200 again), with a Retry-After header when given.</summary>
    public void AnswerNext(int status, string body = "", int times = 1, string? retryAfter = null)
    {
        lock (_script)
        {
            for (var i = 0; i < times; i++)
            {
                _script.Enqueue((status, body, retryAfter));
            }
        }
    }

    public void Dispose()
    {
        _listener.Stop();
        _listener.Close();
        try
        {
            _loop.Wait(TimeSpan.FromSeconds(10));
        }
        catch (AggregateException)
        {
            // The loop ends with the listener's ObjectDisposedException or HttpListenerException.
        }
    }

    private async Task ServeAsync()
    {
        while (_listener.IsListening)
        {
            HttpListenerContext context;
            try
            {
                context = await _listener.GetContextAsync();
            }
            catch (Exception ex) when (ex is HttpListenerException or ObjectDisposedException or InvalidOperationException)
            {
                return;
            }

            using var body = new MemoryStream();
            await context.Request.InputStream.CopyToAsync(body);
            (int Status, string Body, string? RetryAfter) answer;
            lock (_script)
            {
                answer = _script.Count > 0 ? _script.Dequeue() : (200, "accepted", null);
            }

            var request = context.Request;
            lock (_received)
            {
                _received.Add(new ReceivedPost(
                    request.Headers["X-DriftWatch-Timestamp"],
                    request.Headers["X-DriftWatch-Signature"],
                    request.Headers["X-DriftWatch-Delivery-Id"],
                    request.ContentType,
                    request.HttpMethod,
                    body.ToArray(),
                    answer.Status));
            }

            context.Response.StatusCode = answer.Status;
            if (answer.RetryAfter is { } retryAfter)
            {
                context.Response.AddHeader("Retry-After", retryAfter);
            }

            var bytes = System.Text.Encoding.UTF8.GetBytes(answer.Body);
            context.Response.ContentLength64 = bytes.Length;
            await context.Response.OutputStream.WriteAsync(bytes);
            context.Response.Close();
        }
    }
}
