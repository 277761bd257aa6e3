using DriftWatch.Dashboard.Pages;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;

namespace DriftWatch.Dashboard.Access;

/// <summary>GET/POST /login and POST /logout: the token typed once, then a session cookie.</summary>
internal static class LoginEndpoints
{
    /// <summary>A session lasts a working day; the token itself never expires, so signing in again is cheap.</summary>
    public static readonly TimeSpan SessionLifetime = TimeSpan.FromHours(12);

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

            if (!access.CheckToken(form?["token"].ToString()))
            {
                DashboardEndpoints.PageHeaders(http);
                return Results.Content(LoginPage.Render(time.GetUtcNow(), next, "That is not the access token."), "text/html; charset=utf-8", statusCode: StatusCodes.Status401Unauthorized);
            }

            http.Response.Cookies.Append(DashboardAccess.CookieName, access.SessionValue!, new CookieOptions
            {
                HttpOnly = true,
                SameSite = SameSiteMode.Strict,
                Secure = http.Request.IsHttps,
                Path = "/",
                MaxAge = SessionLifetime,
            });
            return Results.Redirect(next);
        });

        app.MapPost("/logout", (HttpContext http) =>
        {
            http.Response.Cookies.Delete(DashboardAccess.CookieName, new CookieOptions { Path = "/" });
            return Results.Redirect(access.TokenRequired ? "/login" : "/");
        });
    }
}
