using System.Net;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Tests.Dashboard.Access;

/// <summary>
/// A loopback dashboard without a token answers only to loopback names in Host, against DNS rebinding (a name
/// an attacker controls, resolved to 127.0.0.1, reaches the dashboard with that name in Host; common practice).
/// The Host header is defined in RFC 9110 section 7.2; 421 Misdirected Request in section 15.5.20.
/// </summary>
public sealed class HostAllowListTests
{
    [Theory]
    [InlineData("rebind.example:8087")]
    [InlineData("127.0.0.1.rebind.example")]
    [InlineData("localhost.")]
    public async Task LoopbackWithoutToken_ForeignHost_Is421WithAShortText(string hostHeader)
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await DashboardHost.StartAsync(scenario);

        foreach (var path in new[] { "/api/pairs", "/", "/login", "/healthz" })
        {
            using var request = new HttpRequestMessage(HttpMethod.Get, path);
            request.Headers.Host = hostHeader;
            using var response = await host.Client.SendAsync(request);
            Assert.Equal(HttpStatusCode.MisdirectedRequest, response.StatusCode);
            var text = await response.Content.ReadAsStringAsync();
            Assert.StartsWith("This dashboard answers only to ", text, StringComparison.Ordinal);
            Assert.DoesNotContain(DashboardScenario.Healthy, text, StringComparison.Ordinal);
        }
    }

    [Theory]
    [InlineData("localhost")]
    [InlineData("LOCALHOST:9000")]
    [InlineData("127.0.0.1:8087")]
    [InlineData("[::1]:8087")]
    public async Task LoopbackWithoutToken_LoopbackNames_AnyPort_AreServed(string hostHeader)
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await DashboardHost.StartAsync(scenario);

        using var request = new HttpRequestMessage(HttpMethod.Get, "/api/pairs");
        request.Headers.Host = hostHeader;
        using var response = await host.Client.SendAsync(request);
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
    }

    [Fact]
    public async Task WithToken_AnyHostName_IsLeftToTheToken()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await DashboardHost.StartAsync(scenario, new DashboardConfig { Bind = "0.0.0.0", AccessToken = "k7Qm2v9XwL4pR8sT1nZc" });

        using var request = new HttpRequestMessage(HttpMethod.Get, "/api/pairs");
        request.Headers.Host = "dashboard.example.org";
        using var response = await host.Client.SendAsync(request);
        Assert.Equal(HttpStatusCode.Unauthorized, response.StatusCode);
    }
}
