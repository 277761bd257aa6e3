using System.Net;
using System.Net.Http.Headers;
using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard.Access;

namespace DriftWatch.Tests.Dashboard.Access;

/// <summary>
/// A dashboard configured to listen beyond loopback (bind 0.0.0.0) with an access token. The test server
/// itself listens on 127.0.0.1 (network rule), but the access rules come from the configuration.
/// </summary>
public sealed class AccessTests
{
    private const string Token = "k7Qm2v9XwL4pR8sT1nZc";

    private static readonly DashboardConfig Exposed = new() { Bind = "0.0.0.0", Port = 8087, AccessToken = Token };

    [Theory]
    [InlineData("/api/pairs")]
    [InlineData("/api/alerts")]
    [InlineData("/api/pairs/orders.total_vs_items/runs")]
    [InlineData("/metrics")]
    [InlineData("/healthz")]
    public async Task MachineEndpoints_WithoutOrWithAWrongToken_Are401_WithTheRightOne200(string path)
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await DashboardHost.StartAsync(scenario, Exposed, DriftWatch.Dashboard.WorkerHealth.From(() => true));

        using var bare = await host.Client.GetAsync(new Uri(path, UriKind.Relative));
        Assert.Equal(HttpStatusCode.Unauthorized, bare.StatusCode);
        Assert.Equal("Bearer", bare.Headers.WwwAuthenticate.Single().Scheme);

        Assert.Equal(HttpStatusCode.Unauthorized, await Get(host, path, "Bearer not-the-token-at-all"));
        Assert.Equal(HttpStatusCode.Unauthorized, await Get(host, path, "Basic " + Token));
        Assert.Equal(HttpStatusCode.OK, await Get(host, path, "Bearer " + Token));
    }

    [Fact]
    public async Task Pages_WithoutToken_RedirectToLogin_AndTheLoginCookieOpensThem()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await DashboardHost.StartAsync(scenario, Exposed);

        using var bare = await host.Client.GetAsync(new Uri("/alerts?pair=x", UriKind.Relative));
        Assert.Equal(HttpStatusCode.Redirect, bare.StatusCode);
        Assert.Equal("/login?next=%2Falerts%3Fpair%3Dx", bare.Headers.Location!.OriginalString);

        var (loginStatus, loginPage) = await host.GetAsync("/login?next=%2Falerts");
        Assert.Equal(200, loginStatus);
        Assert.Contains("name=\"token\"", loginPage, StringComparison.Ordinal);

        using var wrong = await host.Client.PostAsync(new Uri("/login", UriKind.Relative), Form("nope", "/alerts"));
        Assert.Equal(HttpStatusCode.Unauthorized, wrong.StatusCode);
        Assert.False(wrong.Headers.Contains("Set-Cookie"));

        using var right = await host.Client.PostAsync(new Uri("/login", UriKind.Relative), Form(Token, "/alerts"));
        Assert.Equal(HttpStatusCode.Redirect, right.StatusCode);
        Assert.Equal("/alerts", right.Headers.Location!.OriginalString);
        var cookie = right.Headers.GetValues("Set-Cookie").Single();
        Assert.StartsWith(DashboardAccess.CookieName + "=", cookie, StringComparison.Ordinal);
        Assert.Contains("httponly", cookie, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("samesite=strict", cookie, StringComparison.OrdinalIgnoreCase);
        // The cookie is not the token itself.
        Assert.DoesNotContain(Token, cookie, StringComparison.Ordinal);

        using var request = new HttpRequestMessage(HttpMethod.Get, "/alerts");
        request.Headers.Add("Cookie", cookie.Split(';')[0]);
        using var page = await host.Client.SendAsync(request);
        Assert.Equal(HttpStatusCode.OK, page.StatusCode);
        Assert.Contains("Sign out", await page.Content.ReadAsStringAsync(), StringComparison.Ordinal);

        // A forged cookie does not.
        using var forged = new HttpRequestMessage(HttpMethod.Get, "/alerts");
        forged.Headers.Add("Cookie", DashboardAccess.CookieName + "=" + new string('0', 64));
        using var refused = await host.Client.SendAsync(forged);
        Assert.Equal(HttpStatusCode.Redirect, refused.StatusCode);
    }

    [Fact]
    public async Task Login_NextPointingElsewhere_StaysOnTheDashboard()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await DashboardHost.StartAsync(scenario, Exposed);

        foreach (var next in new[] { "//evil.example/", "https://evil.example/", "/\\evil.example" })
        {
            using var response = await host.Client.PostAsync(new Uri("/login", UriKind.Relative), Form(Token, next));
            Assert.Equal("/", response.Headers.Location!.OriginalString);
        }
    }

    [Fact]
    public async Task Start_SaysWhetherATokenIsRequired()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using (var exposed = await DashboardHost.StartAsync(scenario, Exposed))
        {
            Assert.Contains(exposed.Logs.Lines, l => l.StartsWith("Dashboard listening on http://127.0.0.1:", StringComparison.Ordinal) && l.Contains("access token required", StringComparison.Ordinal));
        }

        await using var local = await DashboardHost.StartAsync(scenario);
        Assert.Contains(local.Logs.Lines, l => l.Contains("loopback only, no access token", StringComparison.Ordinal));
        Assert.Equal(200, (await local.GetAsync("/api/pairs")).Status);
    }

    [Theory]
    [InlineData("0.0.0.0")]
    [InlineData("::")]
    [InlineData("192.168.1.20")]
    public void Access_BindBeyondLoopbackWithoutToken_RefusesToStart(string bind)
    {
        var error = Assert.Throws<InvalidOperationException>(() => new DashboardAccess(new DashboardConfig { Bind = bind }));
        Assert.Contains("access_token", error.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("127.0.0.1", true)]
    [InlineData("127.0.0.2", true)]
    [InlineData("::1", true)]
    [InlineData("localhost", true)]
    [InlineData("0.0.0.0", false)]
    [InlineData("10.0.0.5", false)]
    [InlineData("dashboard.internal", false)]
    public void IsLoopback_FollowsTheAddressFamilyRules(string bind, bool loopback) =>
        // 127.0.0.0/8 and ::1 are loopback (RFC 1122 section 3.2.1.3, RFC 4291 section 2.5.3).
        Assert.Equal(loopback, DashboardAccess.IsLoopback(bind));

    private static async Task<HttpStatusCode> Get(DashboardHost host, string path, string authorization)
    {
        using var request = new HttpRequestMessage(HttpMethod.Get, path);
        request.Headers.Authorization = AuthenticationHeaderValue.Parse(authorization);
        using var response = await host.Client.SendAsync(request);
        return response.StatusCode;
    }

    private static FormUrlEncodedContent Form(string token, string next) => new([new("token", token), new("next", next)]);
}
