using Microsoft.Playwright;

namespace DriftWatch.BrowserTests.Dashboard;

/// <summary>
/// The operating system's Chromium driven by Playwright; no browser is downloaded. Path from DRIFTWATCH_CHROMIUM
/// (default /usr/bin/chromium). A missing browser fails the test with the way to install it.
/// </summary>
internal static class Chromium
{
    public const string DefaultPath = "/usr/bin/chromium";

    public static string ExecutablePath => Environment.GetEnvironmentVariable("DRIFTWATCH_CHROMIUM") is { Length: > 0 } path ? path : DefaultPath;

    public static async Task<(IPlaywright Playwright, IBrowser Browser)> LaunchAsync()
    {
        var path = ExecutablePath;
        Assert.True(File.Exists(path), $"Chromium not found at {path}: install it (apt-get install -y chromium) or set DRIFTWATCH_CHROMIUM. The browser tests never download one.");
        Environment.SetEnvironmentVariable("PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD", "1");
        var playwright = await Playwright.CreateAsync();
        try
        {
            var browser = await playwright.Chromium.LaunchAsync(new BrowserTypeLaunchOptions
            {
                ExecutablePath = path,
                Headless = true,
                Args = ["--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run"],
            });
            return (playwright, browser);
        }
        catch
        {
            playwright.Dispose();
            throw;
        }
    }
}
