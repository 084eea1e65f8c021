using TraceKin.Tests.Series;

// dotnet run -c Release --project bench/TraceKin.Bench.Coverage -- [N] [series]   (defaults 200 and 200)
var n = args.Length > 0 ? int.Parse(args[0]) : 200;
var series = args.Length > 1 ? int.Parse(args[1]) : 200;
var only = args.Length > 2 ? args[2] : null; // e.g. "first/drift"
foreach (var (law, condition) in new[] { ("first", "clean"), ("mixed", "clean"), ("first", "spikes"), ("first", "drift") }.Where(c => only is null || only == $"{c.Item1}/{c.Item2}"))
    Console.WriteLine(SeriesCoverage.Run(law, n, series, condition, firstSeed: 90_000));
