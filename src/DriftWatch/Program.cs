using DriftWatch.Cli;

return await CliApp.RunAsync(args, CancellationToken.None);
