using System.Globalization;
using DriftWatch.Dashboard.Pages;
using DriftWatch.Triage;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;

namespace DriftWatch.Dashboard.Access;

/// <summary>
/// GET/POST /login and POST /logout: the token typed once (when one is configured) and the person's name, then a
/// session cookie (<see cref="DashboardSessions"/>). Without a token the form asks only for the name: reading needs
/// no session there, the actions do (their CSRF token lives in it).
/// </summary>
internal static class LoginEndpoints
{
    public static void Map(IEndpointRouteBuilder app, DashboardAccess access, TimeProvider time)
    {
        var nameFromProxy = access.UserHeader is not null;
        app.MapGet("/login", (HttpContext http) =>
        {
            var next = AccessFilter.SafeNext(http.Request.Query["next"].ToString());
            DashboardEndpoints.PageHeaders(http);
            return Results.Content(LoginPage.Render(time.GetUtcNow(), next, null, access.TokenRequired, nameFromProxy), "text/html; charset=utf-8");
        });

        app.MapPost("/login", async (HttpContext http) =>
        {
            var form = http.Request.HasFormContentType ? await http.Request.ReadFormAsync(http.RequestAborted) : null;
            var next = AccessFilter.SafeNext(form?["next"].ToString());
            var name = Actor.Clean(form?["name"].ToString());
            if (!access.TokenRequired)
            {
                if (name is null && !nameFromProxy)
                {
                    DashboardEndpoints.PageHeaders(http);
                    return Results.Content(LoginPage.Render(time.GetUtcNow(), next, "Give your name: the audit log records who acted.", false, nameFromProxy), "text/html; charset=utf-8", statusCode: StatusCodes.Status400BadRequest);
                }

                return SignIn(http, access, name, next);
            }

            var client = http.Connection.RemoteIpAddress;
            if (access.Throttle.RetryAfter(client) is { } wait)
            {
                var seconds = Math.Max(1, (int)Math.Ceiling(wait.TotalSeconds));
                http.Response.Headers.RetryAfter = seconds.ToString(CultureInfo.InvariantCulture);
                DashboardEndpoints.PageHeaders(http);
                return Results.Content(
                    LoginPage.Render(time.GetUtcNow(), next, $"Too many failed sign-ins from your address; try again in {seconds} s."),
                    "text/html; charset=utf-8", statusCode: StatusCodes.Status429TooManyRequests);
            }

            if (!access.CheckToken(form?["token"].ToString()))
            {
                access.Throttle.Failed(client);
                DashboardEndpoints.PageHeaders(http);
                return Results.Content(LoginPage.Render(time.GetUtcNow(), next, "That is not the access token.", true, nameFromProxy), "text/html; charset=utf-8", statusCode: StatusCodes.Status401Unauthorized);
            }

            return SignIn(http, access, name, next);
        });

        app.MapPost("/logout", (HttpContext http) =>
        {
            // Ended on the server, not only forgotten by this browser: a copy of the cookie stops working too.
            access.Sessions.End(http.Request.Cookies[DashboardAccess.CookieName]);
            http.Response.Cookies.Delete(DashboardAccess.CookieName, new CookieOptions { Path = "/" });
            return Results.Redirect(access.TokenRequired ? "/login" : "/");
        });
    }

    private static IResult SignIn(HttpContext http, DashboardAccess access, string? name, string next)
    {
        var (session, _) = access.Sessions.Start(name);
        http.Response.Cookies.Append(DashboardAccess.CookieName, session, new CookieOptions
        {
            HttpOnly = true,
            SameSite = SameSiteMode.Strict,
            Secure = http.Request.IsHttps,
            Path = "/",
            // Max-Age, not Expires: the browser counts it on its own clock, so a skewed server clock cannot make the
            // cookie arrive already expired. The server ends the session at its own time either way.
            MaxAge = DashboardSessions.Lifetime,
        });
        return Results.Redirect(next);
    }
}
