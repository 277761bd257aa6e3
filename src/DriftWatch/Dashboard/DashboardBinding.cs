using System.Globalization;
using System.Net;
using System.Net.Sockets;
using DriftWatch.Core.Configuration;
using Microsoft.AspNetCore.Connections;

namespace DriftWatch.Dashboard;

/// <summary>
/// The one reading of <c>dashboard.bind</c>: the text becomes an <see cref="IPAddress"/> once, and the listen
/// endpoint, the loopback decision and the messages all come from that address. Kestrel is given an
/// <see cref="IPEndPoint"/>, never a URL built from the text (a URL of "[::1]" bracketed again made Kestrel
/// listen on every interface).
/// </summary>
internal static class DashboardBinding
{
    /// <summary>
    /// Reads "127.0.0.1", "::1", "[::1]" or "localhost" (the IPv4 loopback address, 127.0.0.1). An IPv4 address
    /// written in its IPv6-mapped form (<c>::ffff:127.0.0.1</c>) is the IPv4 address: that is what a socket bound
    /// to it would accept, and binding the mapped form itself fails on an IPv6-only socket.
    /// </summary>
    public static bool TryParse(string? text, out IPAddress address)
    {
        address = IPAddress.None;
        var value = text?.Trim();
        if (string.IsNullOrEmpty(value))
        {
            return false;
        }

        if (string.Equals(value, "localhost", StringComparison.OrdinalIgnoreCase))
        {
            address = IPAddress.Loopback;
            return true;
        }

        if (value.StartsWith('[') && value.EndsWith(']'))
        {
            value = value[1..^1];
            // Brackets belong around IPv6 addresses only.
            if (!value.Contains(':', StringComparison.Ordinal))
            {
                return false;
            }
        }

        if (!IPAddress.TryParse(value, out var parsed) || value.Contains('[', StringComparison.Ordinal))
        {
            return false;
        }

        address = parsed.IsIPv4MappedToIPv6 ? parsed.MapToIPv4() : parsed;
        return true;
    }

    /// <summary>The parsed bind address; the loader has refused every text this could not read.</summary>
    public static IPAddress Parse(string text) =>
        TryParse(text, out var address)
            ? address
            : throw new InvalidOperationException($"dashboard.bind '{text}' is not an IP address or localhost.");

    /// <summary>127.0.0.0/8 and ::1 (RFC 1122 section 3.2.1.3, RFC 4291 section 2.5.3); nothing else, not 0.0.0.0 or ::.</summary>
    public static bool IsLoopback(IPAddress address)
    {
        ArgumentNullException.ThrowIfNull(address);
        var plain = address.IsIPv4MappedToIPv6 ? address.MapToIPv4() : address;
        return plain.AddressFamily == AddressFamily.InterNetwork
            ? plain.GetAddressBytes()[0] == 127
            : plain.Equals(IPAddress.IPv6Loopback);
    }

    public static IPEndPoint EndPoint(DashboardConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        return new IPEndPoint(Parse(config.Bind), config.Port);
    }

    /// <summary>"127.0.0.1 port 8087", "::1 port 8087": the address as written in the configuration, and the port.</summary>
    public static string Describe(IPEndPoint endPoint)
    {
        ArgumentNullException.ThrowIfNull(endPoint);
        return endPoint.Address + " port " + endPoint.Port.ToString(CultureInfo.InvariantCulture);
    }

    /// <summary>
    /// Whether the endpoint can be bound now (nothing else listens there, the address belongs to this machine):
    /// null when it can, otherwise one line naming address and port. Checked before the worker starts anything,
    /// so a taken port stops the start with that line instead of a trace.
    /// </summary>
    public static string? Probe(IPEndPoint endPoint)
    {
        ArgumentNullException.ThrowIfNull(endPoint);
        try
        {
            using var socket = new Socket(endPoint.AddressFamily, SocketType.Stream, ProtocolType.Tcp);
            if (endPoint.AddressFamily == AddressFamily.InterNetworkV6)
            {
                // As Kestrel binds an IPv6 address other than "::": that address only.
                socket.DualMode = endPoint.Address.Equals(IPAddress.IPv6Any);
            }

            socket.Bind(endPoint);
            socket.Listen(1);
            return null;
        }
        catch (SocketException ex)
        {
            return Failure(endPoint, ex);
        }
    }

    /// <summary>One line for an exception Kestrel threw while binding; null when the exception is about something else.</summary>
    public static string? Failure(IPEndPoint endPoint, Exception exception)
    {
        ArgumentNullException.ThrowIfNull(endPoint);
        for (var ex = exception; ex is not null; ex = ex.InnerException)
        {
            switch (ex)
            {
                case AddressInUseException:
                    return Line(endPoint, "the port is already in use");
                case SocketException socket:
                    return Line(endPoint, socket.SocketErrorCode == SocketError.AddressAlreadyInUse ? "the port is already in use" : socket.Message);
            }
        }

        return null;
    }

    private static string Line(IPEndPoint endPoint, string reason) =>
        $"cannot serve the dashboard on {Describe(endPoint)}: {reason} (dashboard.bind, dashboard.port)";
}
