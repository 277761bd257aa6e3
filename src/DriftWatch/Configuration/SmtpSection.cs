using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary><c>alerting.smtp:</c> the mail server alerts go through.</summary>
internal static class SmtpSection
{
    public static SmtpConfig? Read(MappingReader? reader)
    {
        if (reader is null)
        {
            return null;
        }

        var host = Required(reader, "host", "the SMTP server's name or address");
        var port = reader.Int("port", 1, 65_535) ?? SmtpConfig.DefaultPort;
        var security = reader.Choice("security", ("starttls", SmtpSecurity.StartTls), ("tls", SmtpSecurity.Tls), ("none", SmtpSecurity.None))
            ?? SmtpSecurity.StartTls;
        var caFile = ReadCaFile(reader, security);
        var user = reader.Text("user");
        var password = ReadPassword(reader);
        var from = Required(reader, "from", "the sender address, e.g. DriftWatch <driftwatch@example.org>");
        if (from is not null && Mail.CheckAddress(from) is { } fromProblem)
        {
            reader.Error("from", fromProblem);
            from = null;
        }

        if (user is null && password is not null)
        {
            reader.Error(reader.Has("password") ? "password" : "password_file", "is given without user; SMTP authentication needs both");
        }
        else if (user is not null && password is null && !reader.Has("password") && !reader.Has("password_file"))
        {
            reader.Error("user", "is given without password or password_file; SMTP authentication needs both");
        }

        reader.Done();
        return host is null || from is null
            ? null
            : new SmtpConfig { Host = host, Port = port, Security = security, CaFile = caFile, User = user, Password = password, From = from };
    }

    /// <summary>A PEM file of private certificate authorities, checked now so a wrong path never waits for the first alert.</summary>
    private static string? ReadCaFile(MappingReader reader, SmtpSecurity security)
    {
        var file = reader.Text("ca_file");
        if (file is null)
        {
            return null;
        }

        if (security == SmtpSecurity.None)
        {
            reader.Error("ca_file", "is given but security is none: without TLS no certificate is checked; use starttls or tls");
            return null;
        }

        var path = reader.Context.ResolvePath(file);
        if (TrustedAuthorities.Read(path, out var problem) is null)
        {
            reader.Error("ca_file", problem!);
            return null;
        }

        return path;
    }

    private static string? ReadPassword(MappingReader reader)
    {
        var password = reader.Text("password", secret: true);
        var file = reader.Text("password_file");
        if (password is not null && file is not null)
        {
            reader.Error("password_file", "and password are both given; keep one of them");
            return null;
        }

        if (file is null)
        {
            return password;
        }

        var fromFile = SecretFiles.Read(reader.Context.ResolvePath(file), out var problem);
        if (fromFile is null && reader.Context.Offline)
        {
            reader.Context.SkipOffline(reader.KeyPath("password_file"), problem + "; not checked offline");
            return ConfigContext.OfflinePlaceholder;
        }

        if (fromFile is null)
        {
            reader.Error("password_file", problem!);
        }

        return fromFile;
    }

    private static string? Required(MappingReader reader, string key, string what)
    {
        if (!reader.Has(key))
        {
            _ = reader.Node(key);
            reader.Missing(key, $"is required: {what}");
            return null;
        }

        return reader.Text(key);
    }
}
