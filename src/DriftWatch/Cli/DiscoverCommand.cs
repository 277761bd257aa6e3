using System.CommandLine;
using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Discovery;
using DriftWatch.Output;
using DriftWatch.Sources;

namespace DriftWatch.Cli;

/// <summary>
/// <c>driftwatch discover</c>: surveys every numeric column of one table (<see cref="ITableSurvey"/>), flags columns
/// that are copies or exact functions of others, ranks the pairs worth watching and proposes them as <c>pairs:</c>
/// entries. Reads only; never edits the configuration.
/// </summary>
internal static class DiscoverCommand
{
    public const int MinSampleRows = 10;
    public const int MaxSampleRows = 1_000_000;

    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var config = ConfigOption.Create();
        var source = new Option<string>("--source", "-s") { Description = "The source (a name under sources: in the configuration) that holds the table.", HelpName = "NAME", Required = true };
        var table = new Option<string>("--table", "-t") { Description = "The table or view to survey: name or schema.name.", HelpName = "TABLE", Required = true };
        var minR = CommonOptions.Number("--min-r", 0, 1,
            $"Propose pairs whose |r| over the whole table is at least this (default {Invariant(TableDiscovery.DefaultMinR)}).", "R");
        var maxColumns = new Option<int>("--max-columns")
        {
            Description = $"Survey at most this many numeric columns, the first in catalogue order (default {ColumnSelection.DefaultMaxColumns}); the pairs grow with its square.",
            HelpName = "N",
            DefaultValueFactory = _ => ColumnSelection.DefaultMaxColumns,
        };
        var sample = new Option<int>("--sample")
        {
            Description = $"Rows of the one sample every candidate is profiled on (default {SampleSpec.DefaultRows}; smaller tables are read whole).",
            HelpName = "N",
            DefaultValueFactory = _ => SampleSpec.DefaultRows,
        };
        var write = new Option<string?>("--write")
        {
            Description = "Append the proposed pairs: entries to this file (created when missing). Never the configuration file: paste the entries into it yourself.",
            HelpName = "FILE",
        };
        var format = new Option<string>("--format")
        {
            Description = "Output: 'table' for people (the default), 'json' for scripts, 'yaml' for the proposed pairs: block alone.",
            HelpName = "table|json|yaml",
            DefaultValueFactory = _ => "table",
        };
        format.AcceptOnlyFromAmong("table", "json", "yaml");

        var command = new Command(
            "discover",
            "Survey the numeric columns of one table: the exact correlation matrix (computed by the database over the whole table), " +
            "columns that are copies or exact functions of others (a data smell, shown with the equation), and the pairs worth watching, " +
            "each profiled on one shared sample; then propose them as pairs: entries for the configuration. Reads only. " +
            "Exit code 0: surveyed; 2: bad input (unknown source or table, no numeric columns); 3: the source failed.\n\n" +
            "Example: driftwatch discover --source warehouse --table parcels --min-r 0.6 --write proposed-pairs.yaml")
        {
            config, source, table, minR, maxColumns, sample, write, format,
        };
        command.SetAction(async (parse, ct) =>
        {
            var maxCols = parse.GetValue(maxColumns);
            var sampleRows = parse.GetValue(sample);
            if (maxCols < 2)
            {
                throw new CliUsageException($"--max-columns must be at least 2, was {maxCols}");
            }

            if (sampleRows is < MinSampleRows or > MaxSampleRows)
            {
                throw new CliUsageException($"--sample must be between {MinSampleRows} and {MaxSampleRows}, was {sampleRows}");
            }

            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            var sourceName = parse.GetValue(source)!;
            var sourceConfig = loaded.FindSource(sourceName)
                ?? throw new CliUsageException($"no source named '{sourceName}' in {loaded.FilePath ?? "the configuration"}{KeyHints.DidYouMean(sourceName, loaded.Sources.Select(s => s.Name))}");
            var target = parse.GetValue(write);
            if (target is not null && DiscoverFile.Refusal(target, loaded.FilePath) is { } refusal)
            {
                throw new CliUsageException(refusal);
            }

            ITableSurvey survey;
            try
            {
                survey = TableSurveys.Create(sourceConfig);
            }
            catch (NotSupportedException e)
            {
                throw new CliUsageException(e.Message);
            }

            var progress = new ImmediateProgress<string>(line => console.Error.WriteLine("discover: " + line));
            TableSurvey surveyed;
            try
            {
                surveyed = await survey.SurveyAsync(new SurveyRequest(parse.GetValue(table)!, maxCols, sampleRows), progress, ct);
            }
            catch (SourceException e) when (e.Failure is SourceFailure.MissingTable or SourceFailure.NonNumericColumn)
            {
                throw new CliUsageException(e.Message);
            }
            catch (SourceException e)
            {
                console.WriteError(e.Message);
                return ExitCodes.RunFailures;
            }

            if (surveyed.Selection.SkippedMessage(maxCols) is { } skipped)
            {
                console.WriteNote(skipped);
            }

            foreach (var constant in surveyed.Stats.Where(s => s.Constant))
            {
                console.WriteNote(constant.Finite == 0
                    ? $"column {constant.Name} has no finite value; it is in no pair"
                    : $"column {constant.Name} is constant ({Figures.Number(constant.Min)}); it is in no pair");
            }

            var profiling = new ImmediateProgress<(int Done, int Total)>(p =>
            {
                if (p.Done == 1 || p.Done == p.Total || p.Done % 100 == 0)
                {
                    console.Error.WriteLine($"discover: profiled {p.Done} of {p.Total} pairs on the shared sample");
                }
            });
            var result = TableDiscovery.Assess(surveyed.Matrix, surveyed.Sample, parse.GetValue(minR) ?? TableDiscovery.DefaultMinR, Core.Statistics.Thresholds.Default, profiling);

            var taken = new HashSet<string>(loaded.Pairs.Select(p => p.Name), StringComparer.Ordinal);

            var tableText = surveyed.Table.ToString();
            var outputFormat = parse.GetValue(format);
            if (target is not null)
            {
                // A second run over the same table proposes the same names: those already in the file are not appended again.
                var written = DiscoverFile.NamesIn(target).ToHashSet(StringComparer.Ordinal);
                var block = DiscoverYaml.Block(sourceConfig.Name, tableText, result, new HashSet<string>(taken.Union(written), StringComparer.Ordinal), header: !DiscoverFile.HasPairsKey(target), written);
                DiscoverFile.Append(target, block);
                console.WriteNote($"appended the proposed entries to {target}; paste them under pairs: in {loaded.FilePath ?? "your configuration"}, then run driftwatch validate");
            }

            var yaml = DiscoverYaml.Block(sourceConfig.Name, tableText, result, taken, header: true);
            switch (outputFormat)
            {
                case "yaml":
                    console.Out.Write(yaml);
                    break;
                case "json":
                    DiscoverView.WriteJson(console, sourceConfig.Name, surveyed, result, yaml);
                    break;
                default:
                    DiscoverView.WriteTables(console, sourceConfig.Name, surveyed, result);
                    break;
            }

            return ExitCodes.Healthy;
        });
        return command;
    }

    private static string Invariant(double value) => value.ToString(CultureInfo.InvariantCulture);
}
