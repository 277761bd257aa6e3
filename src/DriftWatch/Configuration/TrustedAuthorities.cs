using System.Security.Cryptography;
using System.Security.Cryptography.X509Certificates;

namespace DriftWatch.Configuration;

/// <summary>
/// The certificate authorities of <c>alerting.smtp.ca_file</c>: PEM certificates the SMTP server's certificate must
/// chain to. Read once at start-up, so a missing or unreadable file stops the start with one precise message.
/// </summary>
internal static class TrustedAuthorities
{
    /// <summary>The certificates of <paramref name="path"/>, or null and the problem in words.</summary>
    public static X509Certificate2Collection? Read(string path, out string? problem)
    {
        problem = null;
        if (!File.Exists(path))
        {
            problem = $"file {path} does not exist";
            return null;
        }

        var authorities = new X509Certificate2Collection();
        try
        {
            authorities.ImportFromPemFile(path);
        }
        catch (Exception ex) when (ex is CryptographicException or IOException or UnauthorizedAccessException)
        {
            problem = $"file {path} could not be read as PEM certificates: {ex.Message}";
            return null;
        }

        if (authorities.Count == 0)
        {
            problem = $"file {path} holds no PEM certificate (expected -----BEGIN CERTIFICATE-----)";
            return null;
        }

        return authorities;
    }
}
