using System.Net;
using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard;
using DriftWatch.Dashboard.Access;
using Microsoft.Extensions.Time.Testing;

namespace DriftWatch.Tests.Dashboard.Access;

/// <summary>Sessions end at logout and after their lifetime; failed sign-ins are limited per client address.</summary>
public sealed class SessionTests
{
    private const string Token = "k7Qm2v9XwL4pR8sT1nZc";

    private static readonly DashboardConfig Exposed = new() { Bind = "0.0.0.0", Port = 8087, AccessToken = Token };

    [Fact]
    public async Task Logout_EndsTheSessionOnTheServer_ACopyOfTheCookieNoLongerWorks()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await StartAsync(scenario, new FakeTimeProvider(DashboardScenario.Now));

        var cookie = await SignInAsync(host);
        Assert.Equal(HttpStatusCode.OK, await PageWith(host, cookie));

        using var logout = new HttpRequestMessage(HttpMethod.Post, "/logout");
        logout.Headers.Add("Cookie", cookie);
        using var loggedOut = await host.Client.SendAsync(logout);
        Assert.Equal(HttpStatusCode.Redirect, loggedOut.StatusCode);

        // The browser forgot it; a copy kept elsewhere is refused too.
        Assert.Equal(HttpStatusCode.Redirect, await PageWith(host, cookie));
    }

    [Fact]
    public async Task Session_ExpiresAfterItsLifetime_NotBefore()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        var clock = new FakeTimeProvider(DashboardScenario.Now);
        await using var host = await StartAsync(scenario, clock);

        var cookie = await SignInAsync(host);
        clock.Advance(DashboardSessions.Lifetime - TimeSpan.FromMinutes(1));
        Assert.Equal(HttpStatusCode.OK, await PageWith(host, cookie));
        clock.Advance(TimeSpan.FromMinutes(1));
        Assert.Equal(HttpStatusCode.Redirect, await PageWith(host, cookie));
    }

    [Fact]
    public async Task SignIn_EachTimeANewRandomSession_NotDerivedFromTheToken()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await StartAsync(scenario, new FakeTimeProvider(DashboardScenario.Now));

        var first = await SignInAsync(host);
        var second = await SignInAsync(host);
        Assert.NotEqual(first, second);
        // 256 bits as 64 hex digits.
        Assert.Equal(DashboardAccess.CookieName.Length + 1 + 64, first.Length);
        Assert.DoesNotContain(Token, first, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Login_EleventhFailureWithinAMinute_Is429EvenWithTheRightToken_AndTheLimitPasses()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        var clock = new FakeTimeProvider(DashboardScenario.Now);
        await using var host = await StartAsync(scenario, clock);

        for (var i = 0; i < LoginThrottle.MaxFailures; i++)
        {
            using var wrong = await host.Client.PostAsync(new Uri("/login", UriKind.Relative), Form("not-the-token-" + i));
            Assert.Equal(HttpStatusCode.Unauthorized, wrong.StatusCode);
        }

        // Limited: the right token is refused as well, so a guesser cannot tell which guess was right.
        using (var limited = await host.Client.PostAsync(new Uri("/login", UriKind.Relative), Form(Token)))
        {
            Assert.Equal(HttpStatusCode.TooManyRequests, limited.StatusCode);
            Assert.Equal(TimeSpan.FromSeconds(60), limited.Headers.RetryAfter!.Delta);
            Assert.False(limited.Headers.Contains("Set-Cookie"));
        }

        clock.Advance(LoginThrottle.Window);
        using var again = await host.Client.PostAsync(new Uri("/login", UriKind.Relative), Form(Token));
        Assert.Equal(HttpStatusCode.Redirect, again.StatusCode);
    }

    private static Task<DashboardHost> StartAsync(DashboardScenario scenario, TimeProvider clock) =>
        DashboardHost.StartAsync(new DashboardServerOptions(scenario.Config with { Dashboard = Exposed }, scenario.Database, scenario.History, scenario.Alerts)
        {
            Time = clock,
        });

    /// <summary>Signs in with the token; returns the "name=value" part of the session cookie.</summary>
    private static async Task<string> SignInAsync(DashboardHost host)
    {
        using var response = await host.Client.PostAsync(new Uri("/login", UriKind.Relative), Form(Token));
        Assert.Equal(HttpStatusCode.Redirect, response.StatusCode);
        return response.Headers.GetValues("Set-Cookie").Single().Split(';')[0];
    }

    private static async Task<HttpStatusCode> PageWith(DashboardHost host, string cookie)
    {
        using var request = new HttpRequestMessage(HttpMethod.Get, "/alerts");
        request.Headers.Add("Cookie", cookie);
        using var response = await host.Client.SendAsync(request);
        return response.StatusCode;
    }

    private static FormUrlEncodedContent Form(string token) => new([new("token", token), new("next", "/alerts")]);
}
