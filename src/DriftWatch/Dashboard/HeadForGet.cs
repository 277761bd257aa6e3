using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Routing;

namespace DriftWatch.Dashboard;

/// <summary>
/// Lets every GET endpoint answer HEAD too. Kestrel sends a HEAD response's headers and drops its body, so the
/// handler runs as for GET; only the route's method list has to say HEAD. Endpoints of other methods are left alone.
/// </summary>
internal static class HeadForGet
{
    public static void Allow(EndpointBuilder endpoint)
    {
        ArgumentNullException.ThrowIfNull(endpoint);
        // The matcher reads the last method metadata an endpoint has, so the wider list is appended, not swapped in.
        var methods = endpoint.Metadata.OfType<HttpMethodMetadata>().LastOrDefault();
        if (methods is { HttpMethods: [var only] } && only == "GET")
        {
            endpoint.Metadata.Add(new HttpMethodMetadata(["GET", "HEAD"], methods.AcceptCorsPreflight));
        }
    }
}
