using Microsoft.AspNetCore.Http;

namespace DriftWatch.Dashboard.Access;

/// <summary>
/// Guards every dashboard endpoint but the sign-in form and the static assets. Machines (API, metrics,
/// health) get 401 with a Bearer challenge; people asking for a page are sent to the sign-in form.
/// </summary>
internal sealed class AccessFilter(DashboardAccess access) : IEndpointFilter
{
    public async ValueTask<object?> InvokeAsync(EndpointFilterInvocationContext context, EndpointFilterDelegate next)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(next);
        var http = context.HttpContext;
        if (access.IsAuthorized(http.Request))
        {
            return await next(context);
        }

        if (IsMachinePath(http.Request.Path))
        {
            http.Response.Headers.WWWAuthenticate = "Bearer realm=\"driftwatch\"";
            return Results.Json(new { error = "an access token is required: send Authorization: Bearer <token>" }, statusCode: StatusCodes.Status401Unauthorized);
        }

        var target = http.Request.Path + http.Request.QueryString;
        return Results.Redirect("/login?next=" + Uri.EscapeDataString(target.ToString()));
    }

    public static bool IsMachinePath(PathString path) =>
        path.StartsWithSegments("/api") || path.StartsWithSegments("/metrics") || path.StartsWithSegments("/healthz");

    /// <summary>A sign-in may only send the browser back to a page of this dashboard, never to another site.</summary>
    public static string SafeNext(string? next) =>
        next is { Length: > 0 } n && n[0] == '/' && !n.StartsWith("//", StringComparison.Ordinal) && !n.StartsWith("/\\", StringComparison.Ordinal)
            && !n.Contains("://", StringComparison.Ordinal) && !n.Any(char.IsControl)
            ? n
            : "/";
}
