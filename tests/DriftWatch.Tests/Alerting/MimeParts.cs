using MimeKit;

namespace DriftWatch.Tests.Alerting;

/// <summary>Finds the parts a digest must have, by MIME type (RFC 2046 alternative, RFC 2387 related).</summary>
internal static class MimeParts
{
    public static TextPart Html(MimeMessage message) => Assert.Single(message.BodyParts.OfType<TextPart>(), p => p.IsHtml);

    public static TextPart Plain(MimeMessage message) => Assert.Single(message.BodyParts.OfType<TextPart>(), p => p.IsPlain);

    public static IReadOnlyList<MimePart> Images(MimeMessage message) =>
        [.. message.BodyParts.OfType<MimePart>().Where(p => p.ContentType.IsMimeType("image", "png"))];

    public static byte[] Bytes(MimePart part)
    {
        using var stream = new MemoryStream();
        Assert.NotNull(part.Content);
        part.Content.DecodeTo(stream);
        return stream.ToArray();
    }

    /// <summary>multipart/alternative ( text/plain, multipart/related ( text/html, image/png… ) ).</summary>
    public static void AssertDigestStructure(MimeMessage message, int images)
    {
        var alternative = Assert.IsType<MultipartAlternative>(message.Body);
        Assert.Equal(2, alternative.Count);
        Assert.True(alternative[0].ContentType.IsMimeType("text", "plain"), "first alternative must be text/plain");
        if (images == 0)
        {
            Assert.True(alternative[1].ContentType.IsMimeType("text", "html"), "second alternative must be text/html");
            return;
        }

        var related = Assert.IsType<MultipartRelated>(alternative[1]);
        Assert.True(related[0].ContentType.IsMimeType("text", "html"), "the related part's root must be the HTML");
        Assert.Equal(images, related.Skip(1).Count(p => p.ContentType.IsMimeType("image", "png")));
    }
}
