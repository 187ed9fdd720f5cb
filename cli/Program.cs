using Serimetry.Cli;

return CliHost.Run(args, Console.Out, Console.Error);
