using Spectre.Console;

namespace DriftWatch.Output;

/// <summary>
/// Where a command writes: <see cref="Ansi"/> renders tables and colour onto standard output,
/// <see cref="Out"/> is the same stream for plain text (JSON), <see cref="Error"/> takes warnings and
/// errors. Commands never touch <see cref="Console"/> directly, so tests run them in-process.
/// </summary>
internal sealed class CliConsole
{
    private CliConsole(IAnsiConsole ansi, TextWriter output, TextWriter error)
    {
        Ansi = ansi;
        Out = output;
        Error = error;
    }

    public IAnsiConsole Ansi { get; }

    public TextWriter Out { get; }

    public TextWriter Error { get; }

    /// <summary>
    /// Tables written to a file or a pipe are laid out for this many columns, so no cell wraps: a script reads
    /// one table row per line with names and dates whole (a terminal's own width would cut them at 80).
    /// </summary>
    public const int PipedWidth = 4096;

    /// <summary>
    /// The process console. Spectre detects colour and ANSI support itself: NO_COLOR, a dumb terminal
    /// or output redirected to a file give plain text without escape codes.
    /// </summary>
    public static CliConsole Standard()
    {
        var ansi = AnsiConsole.Create(new AnsiConsoleSettings
        {
            Ansi = AnsiSupport.Detect,
            ColorSystem = ColorSystemSupport.Detect,
            Out = new AnsiConsoleOutput(Console.Out),
        });
        if (Console.IsOutputRedirected)
        {
            ansi.Profile.Width = PipedWidth;
        }

        return new CliConsole(ansi, Console.Out, Console.Error);
    }

    /// <summary>Plain, colourless output into the given writers at a fixed width (tests, files).</summary>
    public static CliConsole ForWriters(TextWriter output, TextWriter error, int width = 120)
    {
        ArgumentNullException.ThrowIfNull(output);
        ArgumentNullException.ThrowIfNull(error);
        var ansi = AnsiConsole.Create(new AnsiConsoleSettings
        {
            Ansi = AnsiSupport.No,
            ColorSystem = ColorSystemSupport.NoColors,
            Interactive = InteractionSupport.No,
            Out = new AnsiConsoleOutput(output),
        });
        ansi.Profile.Width = width;
        return new CliConsole(ansi, output, error);
    }

    public void WriteError(string message) => Error.WriteLine("error: " + message);

    public void WriteWarning(string message) => Error.WriteLine("warning: " + message);

    /// <summary>A remark about the run that is not a problem (which input was used, say).</summary>
    public void WriteNote(string message) => Error.WriteLine("note: " + message);
}
