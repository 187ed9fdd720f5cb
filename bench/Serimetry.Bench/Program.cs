using BenchmarkDotNet.Running;

// Kernel benchmarks; run with scripts/bench.sh (or: dotnet run -c Release --project bench/Serimetry.Bench -- --filter '*').
BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
