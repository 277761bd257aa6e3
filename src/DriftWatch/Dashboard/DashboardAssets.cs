using System.Reflection;
using System.Security.Cryptography;
using System.Text;

namespace DriftWatch.Dashboard;

/// <summary>
/// The stylesheet and the small sorting/filtering script, embedded in the assembly (Dashboard/Assets/**):
/// the dashboard never loads anything from the internet.
/// </summary>
internal static class DashboardAssets
{
    public const string CssPath = "/assets/dashboard.css";
    public const string ScriptPath = "/assets/dashboard.js";

    private static readonly Lazy<string> CssText = new(() => Load("dashboard.css"));
    private static readonly Lazy<string> ScriptText = new(() => Load("dashboard.js"));
    private static readonly Lazy<string> VersionText = new(() =>
        Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(Css + Script)))[..12]);

    public static string Css => CssText.Value;

    public static string Script => ScriptText.Value;

    /// <summary>Changes whenever an asset does: the ETag of both.</summary>
    public static string Version => VersionText.Value;

    private static string Load(string name)
    {
        var resource = "DriftWatch.Dashboard.Assets." + name;
        using var stream = Assembly.GetExecutingAssembly().GetManifestResourceStream(resource)
            ?? throw new InvalidOperationException($"The dashboard asset {resource} is not embedded; check the csproj's EmbeddedResource items.");
        using var reader = new StreamReader(stream, Encoding.UTF8);
        return reader.ReadToEnd();
    }
}
