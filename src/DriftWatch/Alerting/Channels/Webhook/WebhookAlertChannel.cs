using System.Globalization;
using System.Net;
using System.Net.Http.Headers;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Alerting.Channels.Webhook;

/// <summary>
/// Posts the stored JSON body to the mailing list's URL, signed (<see cref="WebhookSignature"/>), with the message's
/// stable id as the delivery id. What the answer means for the outbox: 2xx delivered; 408, 429, 5xx, no connection,
/// a TLS failure or no answer within the list's timeout mean the receiver is unavailable (retried with backoff);
/// any other status (3xx: redirects are not followed; 4xx) means the receiver refused this message, which is recorded
/// as failed and not retried. Errors name the receiver as scheme://host:port only: a URL's path or query may hold a
/// token.
/// </summary>
internal sealed class WebhookAlertChannel(TimeProvider time) : IAlertChannel, IDisposable
{
    /// <summary>How much of a refusing receiver's answer goes into the recorded error.</summary>
    public const int MaxReasonChars = 200;

    private readonly HttpClient _client = new(new SocketsHttpHandler
    {
        // A redirect would carry the signed body somewhere the configuration does not name.
        AllowAutoRedirect = false,
        // DNS changes behind a long-lived worker are picked up.
        PooledConnectionLifetime = TimeSpan.FromMinutes(5),
    })
    {
        // Each post has the list's own timeout (a cancellation below), not the client's.
        Timeout = Timeout.InfiniteTimeSpan,
    };

    public ChannelKind Kind => ChannelKind.Webhook;

    public ChannelBody Body => ChannelBody.Json;

    public async Task SendAsync(OutboxEntry entry, MailingListConfig list, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(entry);
        ArgumentNullException.ThrowIfNull(list);
        if (list.Url is null || string.IsNullOrEmpty(list.Secret))
        {
            throw new ChannelUnavailableException($"Mailing list '{list.Name}' posts to a webhook but has no url or secret configured.");
        }

        var body = entry.Mime ?? throw new InvalidOperationException($"Outbox entry {entry.Id} was claimed without its message.");
        var receiver = Receiver(list.Url);
        var timestamp = time.GetUtcNow().ToUnixTimeSeconds().ToString(CultureInfo.InvariantCulture);
        using var request = new HttpRequestMessage(HttpMethod.Post, list.Url) { Content = new ByteArrayContent(body) };
        request.Content.Headers.ContentType = new MediaTypeHeaderValue(WebhookHeaders.ContentType) { CharSet = "utf-8" };
        request.Headers.UserAgent.Add(new ProductInfoHeaderValue(WebhookHeaders.UserAgent, "1"));
        request.Headers.Add(WebhookHeaders.Timestamp, timestamp);
        request.Headers.Add(WebhookHeaders.Signature, WebhookSignature.Sign(list.Secret, timestamp, body));
        request.Headers.Add(WebhookHeaders.DeliveryId, entry.MessageId);

        using var limit = new CancellationTokenSource(list.Timeout, time);
        using var linked = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken, limit.Token);
        HttpResponseMessage response;
        try
        {
            response = await _client.SendAsync(request, HttpCompletionOption.ResponseHeadersRead, linked.Token);
        }
        catch (OperationCanceledException ex) when (!cancellationToken.IsCancellationRequested)
        {
            throw new ChannelUnavailableException($"Webhook {receiver} of mailing list '{list.Name}' did not answer within {list.Timeout.TotalSeconds.ToString(CultureInfo.InvariantCulture)} s", ex);
        }
        catch (HttpRequestException ex)
        {
            throw new ChannelUnavailableException($"Webhook {receiver} of mailing list '{list.Name}' unavailable: {ex.Message}", ex);
        }

        using (response)
        {
            var status = (int)response.StatusCode;
            if (response.IsSuccessStatusCode)
            {
                return;
            }

            var reason = await ReasonAsync(response, linked.Token);
            if (IsUnavailable(response.StatusCode))
            {
                throw new ChannelUnavailableException($"Webhook {receiver} of mailing list '{list.Name}' unavailable: HTTP {status}{reason}")
                {
                    RetryAfter = AskedToWait(response, time.GetUtcNow()),
                };
            }

            throw new MessageRefusedException($"Webhook {receiver} of mailing list '{list.Name}' refused message {entry.MessageId}: HTTP {status}{reason}");
        }
    }

    public void Dispose() => _client.Dispose();

    /// <summary>408, 429 and 5xx say "not now": the same post may be taken later.</summary>
    public static bool IsUnavailable(HttpStatusCode status) =>
        status is HttpStatusCode.RequestTimeout or HttpStatusCode.TooManyRequests || (int)status >= 500;

    /// <summary>
    /// The wait a 429 or 503 asks for in its Retry-After header, as seconds or as an HTTP date (RFC 9110, section
    /// 10.2.3); null without one, or for a date already past.
    /// </summary>
    public static TimeSpan? AskedToWait(HttpResponseMessage response, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(response);
        var header = response.Headers.RetryAfter;
        var wait = header?.Delta ?? (header?.Date is { } date ? date - now : null);
        return wait is { } w && w > TimeSpan.Zero ? w : null;
    }

    /// <summary>scheme://host:port, the part of a URL that is safe to log.</summary>
    public static string Receiver(Uri url)
    {
        ArgumentNullException.ThrowIfNull(url);
        return url.GetLeftPart(UriPartial.Authority);
    }

    /// <summary>The status's reason phrase and the start of the answer's body, on one line, for the recorded error.</summary>
    private static async Task<string> ReasonAsync(HttpResponseMessage response, CancellationToken cancellationToken)
    {
        string text;
        try
        {
            // Only the start is kept; a receiver's long error page is not read to its end.
            await using var stream = await response.Content.ReadAsStreamAsync(cancellationToken);
            var buffer = new byte[4 * MaxReasonChars];
            var read = await stream.ReadAtLeastAsync(buffer, buffer.Length, throwOnEndOfStream: false, cancellationToken);
            text = System.Text.Encoding.UTF8.GetString(buffer, 0, read);
        }
        catch (Exception ex) when (ex is HttpRequestException or IOException or OperationCanceledException)
        {
            // The status alone decides; the answer's text only helps whoever reads the error.
            text = "";
        }

        var oneLine = string.Join(' ', text.Split(['\r', '\n', '\t'], StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries));
        if (oneLine.Length > MaxReasonChars)
        {
            oneLine = oneLine[..MaxReasonChars] + "…";
        }

        var phrase = string.IsNullOrEmpty(response.ReasonPhrase) ? "" : " " + response.ReasonPhrase;
        return oneLine.Length == 0 ? phrase : $"{phrase}: {oneLine}";
    }
}
