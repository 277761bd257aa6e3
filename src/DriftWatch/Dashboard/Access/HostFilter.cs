using Microsoft.AspNetCore.Http;

namespace DriftWatch.Dashboard.Access;

/// <summary>Refuses requests whose Host is not on the allow-list (421, a short text), before any other handling.</summary>
internal sealed class HostFilter(HostAllowList hosts) : IEndpointFilter
{
    public async ValueTask<object?> InvokeAsync(EndpointFilterInvocationContext context, EndpointFilterDelegate next)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(next);
        if (hosts.Allows(context.HttpContext.Request.Host))
        {
            return await next(context);
        }

        return Results.Text(
            $"This dashboard answers only to {string.Join(", ", hosts.Names)} (any port); the Host header of this request is not one of them. " +
            "To reach it under another name, give it an access token (dashboard.access_token).\n",
            "text/plain; charset=utf-8",
            statusCode: StatusCodes.Status421MisdirectedRequest);
    }
}
