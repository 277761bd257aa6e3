using System.Net;
using Microsoft.AspNetCore.Http;

namespace DriftWatch.Dashboard.Access;

/// <summary>
/// The host names a loopback dashboard without a token answers to: localhost, 127.0.0.1, [::1] and the bind
/// address. A web page elsewhere can point a name it controls at 127.0.0.1 (DNS rebinding) and read the
/// dashboard through the visitor's browser; its requests then carry that name in <c>Host</c>, so they are
/// refused. The port is not compared: the attacker controls the name, not the port, and a tunnel or
/// port-forward to another local port must keep working.
/// </summary>
internal sealed class HostAllowList
{
    private readonly HashSet<string> _names = new(StringComparer.OrdinalIgnoreCase) { "localhost", "127.0.0.1", "[::1]" };

    public HostAllowList(IPAddress bind)
    {
        ArgumentNullException.ThrowIfNull(bind);
        _names.Add(bind.AddressFamily == System.Net.Sockets.AddressFamily.InterNetworkV6 ? "[" + bind + "]" : bind.ToString());
    }

    public IReadOnlyCollection<string> Names => _names;

    public bool Allows(HostString host) => host.HasValue && _names.Contains(host.Host);
}
