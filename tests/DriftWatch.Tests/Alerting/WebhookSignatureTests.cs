using System.Text;
using DriftWatch.Alerting.Channels.Webhook;

namespace DriftWatch.Tests.Alerting;

/// <summary>
/// The webhook signature's HMAC-SHA256 against the published test vectors of RFC 4231, "Identifiers and Test Vectors
/// for HMAC-SHA-224, HMAC-SHA-256, HMAC-SHA-384, and HMAC-SHA-512", section 4 (test cases 1, 2, 3, 4, 6 and 7; case 5
/// is a truncated output, which the signature does not use).
/// </summary>
public sealed class WebhookSignatureTests
{
    [Theory]
    // RFC 4231, 4.2, Test Case 1: key 20 × 0x0b, data "Hi There".
    [InlineData("0b0b0b0b0b0b0b0b0b0b0b0b0b0b0b0b0b0b0b0b", "4869205468657265", "b0344c61d8db38535ca8afceaf0bf12b881dc200c9833da726e9376c2e32cff7")]
    // RFC 4231, 4.3, Test Case 2: key "Jefe", data "what do ya want for nothing?".
    [InlineData("4a656665", "7768617420646f2079612077616e7420666f72206e6f7468696e673f", "5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843")]
    // RFC 4231, 4.4, Test Case 3: key 20 × 0xaa, data 50 × 0xdd.
    [InlineData("aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa", "dddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddd", "773ea91e36800e46854db8ebd09181a72959098b3ef8c122d9635514ced565fe")]
    // RFC 4231, 4.5, Test Case 4: key 0x01..0x19, data 50 × 0xcd.
    [InlineData("0102030405060708090a0b0c0d0e0f10111213141516171819", "cdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcdcd", "82558a389a443c0ea4cc819899f2083a85f0faa3e578f8077a2e3ff46729665b")]
    public void Hex_Rfc4231Vectors_MatchThePublishedOutput(string keyHex, string dataHex, string expected)
    {
        Assert.Equal(expected, WebhookSignature.Hex(Convert.FromHexString(keyHex), Convert.FromHexString(dataHex)));
    }

    [Theory]
    // RFC 4231, 4.7, Test Case 6: a key longer than the block size (131 × 0xaa) is hashed first.
    [InlineData("Test Using Larger Than Block-Size Key - Hash Key First", "60e431591ee0b67f0d8a26aacbf5b77f8e0bc6213728c5140546040f0ee37f54")]
    // RFC 4231, 4.8, Test Case 7: the same key with data longer than the block size.
    [InlineData("This is a test using a larger than block-size key and a larger than block-size data. The key needs to be hashed before being used by the HMAC algorithm.", "9b09ffa71b942fcb27635fbcd5b0e944bfdc63644f0713938a7f51535c3a35e2")]
    public void Hex_Rfc4231LongKeyVectors_MatchThePublishedOutput(string data, string expected)
    {
        var key = Enumerable.Repeat((byte)0xaa, 131).ToArray();
        Assert.Equal(expected, WebhookSignature.Hex(key, Encoding.ASCII.GetBytes(data)));
    }

    [Fact]
    public void Sign_SignsTimestampDotBody_WithTheSecretsUtf8Bytes()
    {
        // The signed bytes are exactly the ASCII timestamp, '.', then the body (docs/alerting.md); the HMAC over them
        // is the one the RFC 4231 vectors above check.
        var body = Encoding.UTF8.GetBytes("{\"type\":\"driftwatch.digest\"}");
        var signed = WebhookSignature.SignedBytes("1767225600", body);

        Assert.Equal(Encoding.ASCII.GetBytes("1767225600.{\"type\":\"driftwatch.digest\"}"), signed);
        Assert.Equal(WebhookSignature.Hex(Encoding.UTF8.GetBytes("a secret of 16+ chars"), signed), WebhookSignature.Sign("a secret of 16+ chars", "1767225600", body));
    }

    [Fact]
    public void Sign_AnyChangeOfTimestampOrBody_ChangesTheSignature()
    {
        var body = Encoding.UTF8.GetBytes("{\"id\":\"dw-1\"}");
        var signature = WebhookSignature.Sign("receiver-shared-secret", "1767225600", body);

        Assert.NotEqual(signature, WebhookSignature.Sign("receiver-shared-secret", "1767225601", body));
        Assert.NotEqual(signature, WebhookSignature.Sign("receiver-shared-secret", "1767225600", Encoding.UTF8.GetBytes("{\"id\":\"dw-2\"}")));
        Assert.NotEqual(signature, WebhookSignature.Sign("receiver-shared-secreT", "1767225600", body));
        Assert.Matches("^[0-9a-f]{64}$", signature);
    }
}
