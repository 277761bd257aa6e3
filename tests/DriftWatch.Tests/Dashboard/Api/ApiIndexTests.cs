using System.Net;
using System.Text.Json;

namespace DriftWatch.Tests.Dashboard.Api;

/// <summary>GET /api and HEAD on readable routes, through the real dashboard host (Kestrel on a loopback port).</summary>
[Collection(DashboardScenarioGroup.Name)]
public sealed class ApiIndexTests(DashboardFixture fixture)
{
    private DashboardHost Host => fixture.Host;

    [Fact]
    public async Task Api_ListsTheJsonEndpointsWithMethods_AndEachListedGetAnswers()
    {
        var (status, body) = await Host.GetAsync("/api");

        Assert.Equal(200, status);
        using var json = JsonDocument.Parse(body);
        var endpoints = json.RootElement.GetProperty("endpoints").EnumerateArray()
            .ToDictionary(e => e.GetProperty("path").GetString()!, e => e);
        foreach (var path in new[] { "/api", "/api/pairs", "/api/pairs/{name}/runs", "/api/alerts", "/healthz", "/metrics" })
        {
            Assert.True(endpoints.ContainsKey(path), $"{path} is missing from the index: {body}");
            var methods = endpoints[path].GetProperty("methods").EnumerateArray().Select(m => m.GetString()).ToArray();
            Assert.Contains("GET", methods);
            Assert.Contains("HEAD", methods);
            Assert.False(string.IsNullOrWhiteSpace(endpoints[path].GetProperty("description").GetString()));
        }

        // Assets and the sign-in form are for the pages, not listed.
        Assert.DoesNotContain(endpoints.Keys, k => k.StartsWith("/assets", StringComparison.Ordinal) || k.StartsWith("/login", StringComparison.Ordinal));
        // What the index lists is served: every fixed GET path answers 200.
        foreach (var path in endpoints.Keys.Where(k => !k.Contains('{', StringComparison.Ordinal)))
        {
            Assert.Equal(200, (await Host.GetAsync(path)).Status);
        }
    }

    [Theory]
    [InlineData("/healthz", "application/json")]
    [InlineData("/", "text/html")]
    [InlineData("/api/pairs", "application/json")]
    [InlineData("/metrics", "application/openmetrics-text")]
    public async Task Head_OnAReadableRoute_Is200WithHeadersAndNoBody(string path, string contentType)
    {
        using var request = new HttpRequestMessage(HttpMethod.Head, new Uri(path, UriKind.Relative));
        using var response = await Host.Client.SendAsync(request);

        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        Assert.StartsWith(contentType, response.Content.Headers.ContentType?.ToString(), StringComparison.Ordinal);
        Assert.Empty(await response.Content.ReadAsByteArrayAsync());
    }

    [Fact]
    public async Task Head_OnAPostOnlyRoute_IsStillRefused()
    {
        using var request = new HttpRequestMessage(HttpMethod.Head, new Uri("/logout", UriKind.Relative));
        using var response = await Host.Client.SendAsync(request);

        Assert.Equal(HttpStatusCode.MethodNotAllowed, response.StatusCode);
    }

    [Fact]
    public async Task UnknownPair_PageAndApi_SuggestTheClosestName()
    {
        // The tail of "orders.total_vs_items" after its dot, as a user might type it.
        var (pageStatus, page) = await Host.GetAsync("/pairs/total_vs_items");
        // Two letters swapped: one edit from the configured name.
        var (apiStatus, api) = await Host.GetAsync("/api/pairs/orders.total_vs_itmes/runs");

        Assert.Equal(404, pageStatus);
        Assert.Contains("did you mean &#x27;orders.total_vs_items&#x27;?", page, StringComparison.Ordinal);
        Assert.Equal(404, apiStatus);
        using var json = JsonDocument.Parse(api);
        Assert.Equal("no pair named 'orders.total_vs_itmes' (did you mean 'orders.total_vs_items'?)", json.RootElement.GetProperty("error").GetString());
    }
}
