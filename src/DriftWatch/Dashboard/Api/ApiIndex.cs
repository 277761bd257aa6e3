using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Http.Metadata;
using Microsoft.AspNetCore.Routing;

namespace DriftWatch.Dashboard.Api;

/// <summary>GET /api: what the dashboard serves, so a script can find the JSON endpoints without the docs.</summary>
internal sealed record ApiIndexResponse(IReadOnlyList<ApiEndpointJson> Endpoints);

/// <summary>One route: its methods, its path pattern ("/api/pairs/{name}/runs") and what it answers.</summary>
internal sealed record ApiEndpointJson(IReadOnlyList<string> Methods, string Path, string? Description);

/// <summary>
/// Builds the index from the routes actually mapped (not a list kept by hand), so a new endpoint appears in it
/// by being mapped. Assets and the sign-in form are left out: they are for the pages, not for scripts.
/// </summary>
internal static class ApiIndex
{
    public static ApiIndexResponse Build(EndpointDataSource endpoints)
    {
        ArgumentNullException.ThrowIfNull(endpoints);
        var rows = new List<ApiEndpointJson>();
        foreach (var endpoint in endpoints.Endpoints.OfType<RouteEndpoint>())
        {
            var path = "/" + (endpoint.RoutePattern.RawText ?? string.Empty).TrimStart('/');
            if (path.StartsWith("/assets", StringComparison.Ordinal) || path.StartsWith("/login", StringComparison.Ordinal) || path.StartsWith("/logout", StringComparison.Ordinal))
            {
                continue;
            }

            var methods = endpoint.Metadata.GetMetadata<IHttpMethodMetadata>()?.HttpMethods ?? [];
            rows.Add(new ApiEndpointJson([.. methods.Order(StringComparer.Ordinal)], path, endpoint.Metadata.GetMetadata<IEndpointDescriptionMetadata>()?.Description));
        }

        return new ApiIndexResponse([.. rows.OrderBy(r => r.Path, StringComparer.Ordinal)]);
    }
}
