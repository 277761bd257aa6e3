using System.Globalization;
using DriftWatch.Dashboard.Pages;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;

namespace DriftWatch.Dashboard.Access;

/// <summary>GET/POST /login and POST /logout: the token typed once, then a session cookie (<see cref="DashboardSessions"/>).</summary>
internal static class LoginEndpoints
{
    public static void Map(IEndpointRouteBuilder app, DashboardAccess access, TimeProvider time)
    {
        app.MapGet("/login", (HttpContext http) =>
        {
            var next = AccessFilter.SafeNext(http.Request.Query["next"].ToString());
            if (!access.TokenRequired)
            {
                return Results.Redirect(next);
            }

            DashboardEndpoints.PageHeaders(http);
            return Results.Content(LoginPage.Render(time.GetUtcNow(), next, null), "text/html; charset=utf-8");
        });

        app.MapPost("/login", async (HttpContext http) =>
        {
            var form = http.Request.HasFormContentType ? await http.Request.ReadFormAsync(http.RequestAborted) : null;
            var next = AccessFilter.SafeNext(form?["next"].ToString());
            if (!access.TokenRequired)
            {
                return Results.Redirect(next);
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
                return Results.Content(LoginPage.Render(time.GetUtcNow(), next, "That is not the access token."), "text/html; charset=utf-8", statusCode: StatusCodes.Status401Unauthorized);
            }

            var (session, expires) = access.Sessions.Start();
            http.Response.Cookies.Append(DashboardAccess.CookieName, session, new CookieOptions
            {
                HttpOnly = true,
                SameSite = SameSiteMode.Strict,
                Secure = http.Request.IsHttps,
                Path = "/",
                Expires = expires,
            });
            return Results.Redirect(next);
        });

        app.MapPost("/logout", (HttpContext http) =>
        {
            // Ended on the server, not only forgotten by this browser: a copy of the cookie stops working too.
            access.Sessions.End(http.Request.Cookies[DashboardAccess.CookieName]);
            http.Response.Cookies.Delete(DashboardAccess.CookieName, new CookieOptions { Path = "/" });
            return Results.Redirect(access.TokenRequired ? "/login" : "/");
        });
    }
}
