using System.Net.Security;
using System.Security.Cryptography.X509Certificates;

namespace DriftWatch.Alerting.Channels.Smtp;

/// <summary>
/// Judges the SMTP server's certificate and says in one line why it is refused: MailKit's own refusal spans several
/// lines, and a failed delivery is logged as one line per attempt. With <c>ca_file</c> the certificate must chain to
/// one of its authorities (and only to those); without it, to the operating system's roots.
/// </summary>
internal sealed class ServerCertificateCheck(string host, X509Certificate2Collection? authorities)
{
    /// <summary>Why the last certificate was refused, or null.</summary>
    public string? Problem { get; private set; }

    public bool Validate(object sender, X509Certificate? certificate, X509Chain? chain, SslPolicyErrors errors)
    {
        Problem = Judge(certificate, chain, errors);
        return Problem is null;
    }

    private string? Judge(X509Certificate? certificate, X509Chain? presented, SslPolicyErrors errors)
    {
        if (certificate is null || errors.HasFlag(SslPolicyErrors.RemoteCertificateNotAvailable))
        {
            return "the server sent no certificate";
        }

        if (errors.HasFlag(SslPolicyErrors.RemoteCertificateNameMismatch))
        {
            return $"the server's certificate does not name {host} (subject {certificate.Subject})";
        }

        if (authorities is null)
        {
            return errors == SslPolicyErrors.None ? null : NotTrusted(certificate, presented, "the system's certificate authorities");
        }

        using var chain = new X509Chain();
        chain.ChainPolicy.TrustMode = X509ChainTrustMode.CustomRootTrust;
        chain.ChainPolicy.CustomTrustStore.AddRange(authorities);
        // A private authority seldom publishes revocation lists; trusting it is the operator's explicit choice.
        chain.ChainPolicy.RevocationMode = X509RevocationMode.NoCheck;
        if (presented is not null)
        {
            foreach (var element in presented.ChainElements)
            {
                chain.ChainPolicy.ExtraStore.Add(element.Certificate);
            }
        }

        using var leaf = new X509Certificate2(certificate);
        return chain.Build(leaf) ? null : NotTrusted(certificate, chain, "the authorities of ca_file");
    }

    private static string NotTrusted(X509Certificate certificate, X509Chain? chain, string trusted)
    {
        var reasons = chain?.ChainStatus
            .Where(s => s.Status != X509ChainStatusFlags.NoError)
            .Select(s => s.Status.ToString())
            .Distinct(StringComparer.Ordinal)
            .ToList() ?? [];
        var why = reasons.Count == 0 ? string.Empty : $" ({string.Join(", ", reasons)})";
        return $"the server's certificate (issuer {certificate.Issuer}) is not trusted by {trusted}{why}";
    }
}
