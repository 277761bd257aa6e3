using System.Net;
using System.Security.Cryptography;
using System.Security.Cryptography.X509Certificates;

namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>
/// A certificate authority made in the test with .NET's CertificateRequest, and server certificates it signs for
/// 127.0.0.1 and localhost: what an operator's private authority looks like to the worker.
/// </summary>
public sealed class TestAuthority : IDisposable
{
    // ECDSA P-256: a key in milliseconds, where RSA 2048 takes seconds on a busy machine.
    private readonly ECDsa _key = ECDsa.Create(ECCurve.NamedCurves.nistP256);

    public TestAuthority(string name)
    {
        var request = new CertificateRequest($"CN={name}", _key, HashAlgorithmName.SHA256);
        request.CertificateExtensions.Add(new X509BasicConstraintsExtension(certificateAuthority: true, hasPathLengthConstraint: true, pathLengthConstraint: 0, critical: true));
        request.CertificateExtensions.Add(new X509KeyUsageExtension(X509KeyUsageFlags.KeyCertSign | X509KeyUsageFlags.CrlSign, critical: true));
        request.CertificateExtensions.Add(new X509SubjectKeyIdentifierExtension(request.PublicKey, critical: false));
        Certificate = request.CreateSelfSigned(DateTimeOffset.UtcNow.AddMinutes(-5), DateTimeOffset.UtcNow.AddDays(1));
    }

    public X509Certificate2 Certificate { get; }

    /// <summary>The authority's certificate as PEM, what <c>ca_file</c> holds.</summary>
    public string WritePem(string path)
    {
        File.WriteAllText(path, Certificate.ExportCertificatePem());
        return path;
    }

    /// <summary>A server certificate for 127.0.0.1 and localhost, with its private key, signed by this authority.</summary>
    public X509Certificate2 IssueServerCertificate()
    {
        using var key = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        var request = new CertificateRequest("CN=localhost", key, HashAlgorithmName.SHA256);
        var names = new SubjectAlternativeNameBuilder();
        names.AddDnsName("localhost");
        names.AddIpAddress(IPAddress.Loopback);
        request.CertificateExtensions.Add(names.Build());
        request.CertificateExtensions.Add(new X509BasicConstraintsExtension(false, false, 0, true));
        request.CertificateExtensions.Add(new X509KeyUsageExtension(X509KeyUsageFlags.DigitalSignature, critical: true));
        // id-kp-serverAuth (RFC 5280, 4.2.1.12).
        request.CertificateExtensions.Add(new X509EnhancedKeyUsageExtension([new Oid("1.3.6.1.5.5.7.3.1")], critical: false));
        request.CertificateExtensions.Add(X509AuthorityKeyIdentifierExtension.CreateFromCertificate(Certificate, true, false));
        var serial = RandomNumberGenerator.GetBytes(16);
        serial[0] &= 0x7F;
        using var signed = request.Create(Certificate, DateTimeOffset.UtcNow.AddMinutes(-4), DateTimeOffset.UtcNow.AddHours(12), serial);
        using var withKey = signed.CopyWithPrivateKey(key);
        // Through PKCS#12 so the key is a persisted one, as a TLS server needs.
        return X509CertificateLoader.LoadPkcs12(withKey.Export(X509ContentType.Pkcs12), null);
    }

    public void Dispose()
    {
        Certificate.Dispose();
        _key.Dispose();
    }
}
