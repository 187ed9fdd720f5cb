using BenchmarkDotNet.Running;

// Whole-pipeline comparisons take a verb; everything else goes to BenchmarkDotNet.
if (args.Length > 0 && args[0] == "registration-vs-elastix")
    return Serimetry.Bench.RegistrationVsElastix.Run(args[1..]);
if (args.Length > 0 && args[0] == "compare-speed")
    return Serimetry.Bench.CompareSpeed.Run(args[1..]);
if (args.Length > 0 && args[0] == "radiomics-timing")
    return Serimetry.Bench.RadiomicsTiming.Run(args[1..]);
if (args.Length > 0 && args[0] == "dicomweb-vs-curl")
    return Serimetry.Bench.DicomWebVsCurl.Run(args[1..]);
if (args.Length > 0 && args[0] == "compare-sweep")
    return Serimetry.Bench.CompareSweep.Run(args[1..]);
if (args.Length > 0 && args[0] == "qa-reproducibility")
    return Serimetry.Bench.QaReproducibilitySpeed.Run(args[1..]);
if (args.Length > 0 && args[0] == "scale-out")
    return Serimetry.Bench.ScaleOutSpeed.Run(args[1..]);
if (args.Length > 0 && args[0] == "status-load")
    return Serimetry.Bench.StatusLoad.Run(args[1..]);

// Kernel benchmarks; run with scripts/bench.sh (or: dotnet run -c Release --project bench/Serimetry.Bench -- --filter '*').
BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
return 0;
