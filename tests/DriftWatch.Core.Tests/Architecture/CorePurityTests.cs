using System.Reflection;
using System.Text.RegularExpressions;

namespace DriftWatch.Core.Tests.Architecture;

/// <summary>
/// DriftWatch.Core is pure (no I/O, no logging, no clock); everything else depends on it. These checks make
/// the build, not a document, keep that rule.
/// </summary>
public sealed partial class CorePurityTests
{
    private static readonly Assembly Core = typeof(DriftWatch.Core.Profiling.Profiler).Assembly;

    [Fact]
    public void CoreAssembly_ReferencesOnlyTheRuntimeAndMathNet()
    {
        var references = Core.GetReferencedAssemblies().Select(a => a.Name!).ToList();

        var foreign = references.Where(n => !(n.StartsWith("System", StringComparison.Ordinal) || n == "netstandard" || n.StartsWith("MathNet.", StringComparison.Ordinal))).ToList();

        Assert.Empty(foreign);
        Assert.DoesNotContain(references, n => n.StartsWith("System.Net", StringComparison.Ordinal) || n == "System.Console" || n.StartsWith("System.Data", StringComparison.Ordinal));
    }

    [Fact]
    public void CoreSources_ReadNoClockAndTouchNoFiles()
    {
        var sources = Directory.EnumerateFiles(Path.Combine(RepositoryRoot(), "src", "DriftWatch.Core"), "*.cs", SearchOption.AllDirectories)
            .Where(p => !p.Contains($"{Path.DirectorySeparatorChar}obj{Path.DirectorySeparatorChar}", StringComparison.Ordinal))
            .ToList();
        Assert.NotEmpty(sources);

        var offences = sources
            .SelectMany(path => File.ReadLines(path).Select((line, i) => (path, line, i)))
            .Where(x => Forbidden().IsMatch(x.line))
            .Select(x => $"{Path.GetRelativePath(RepositoryRoot(), x.path)}:{x.i + 1}: {x.line.Trim()}")
            .ToList();

        Assert.Empty(offences);
    }

    [GeneratedRegex(@"DateTime(Offset)?\.(Now|UtcNow|Today)|TimeProvider\.System|\bConsole\.|\bFile\.|\bDirectory\.|using System\.IO|ILogger|Environment\.GetEnvironmentVariable")]
    private static partial Regex Forbidden();

    private static string RepositoryRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "DriftWatch.sln")))
            {
                return dir.FullName;
            }
        }

        throw new InvalidOperationException("DriftWatch.sln not found above " + AppContext.BaseDirectory);
    }
}
