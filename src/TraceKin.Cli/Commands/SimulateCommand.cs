using TraceKin.Analysis;
using System.CommandLine;
using System.Globalization;
using TraceKin.Reports;
using TraceKin.Setup;
using TraceKin.Simulation;
using TraceKin.Traces;

namespace TraceKin.Cli.Commands;

/// <summary>
/// `tracekin simulate SERIES --rate-constant k --order A=1 …`: writes the exports that plan.csv names, from a power-law
/// rate law integrated numerically, through the signal settings of series.toml, with seeded noise.
/// </summary>
public static class SimulateCommand
{
    public static Command Create()
    {
        var series = new Argument<DirectoryInfo>("series") { Description = "Series folder with plan.csv and series.toml; the exports are written there." };
        var k = new Option<double>("--rate-constant", "-k") { Description = "k at the reference temperature, in (mol/L)^(1−Σn)/s.", Required = true };
        var orders = new Option<string[]>("--order") { Description = "Order of a species, e.g. --order A=1 --order H=1 (needed unless --saturation is given).", AllowMultipleArgumentsPerToken = true };
        var saturation = new Option<string?>("--saturation") { Description = "Make the law saturate in a species, SPECIES=Km with Km in mmol/L: v = k·Π[X]^n·[S]/(Km + [S]) (with no --order, k is Vmax in mol/(L·s))." };
        var plate = new Option<int>("--plate") { Description = "Wells of the plate for exports that several plan rows share through their channel (96 or 384; default 96).", DefaultValueFactory = _ => 96 };
        var drift = new Option<double>("--baseline-drift") { Description = "Drift common to every well of a plate export, in signal units per s (default 0).", DefaultValueFactory = _ => 0.0 };
        var coefficients = new Option<string[]>("--coefficient") { Description = "Stoichiometric coefficient ν of a species (default: signal.coefficient for the followed species, −1 for the others with an order).", AllowMultipleArgumentsPerToken = true };
        var force = new Option<bool>("--force") { Description = "Overwrite export files that already exist (by default simulate refuses, so a real export is never replaced)." };
        var ea = new Option<double>("--activation-energy") { Description = "Ea in kJ/mol for runs at other temperatures (default 0)." };
        var tref = new Option<double>("--reference-temperature") { Description = "Temperature (°C) at which k is given (default 25).", DefaultValueFactory = _ => 25.0 };
        var duration = new Option<double>("--duration") { Description = "Run length in s (default 600).", DefaultValueFactory = _ => 600.0 };
        var interval = new Option<double>("--interval") { Description = "Sampling interval in s (default 1).", DefaultValueFactory = _ => 1.0 };
        var noise = new Option<double>("--noise") { Description = "Standard deviation of the signal noise, in signal units (default 0.002).", DefaultValueFactory = _ => 0.002 };
        var seed = new Option<int>("--seed") { Description = "Random seed (default 1).", DefaultValueFactory = _ => 1 };
        var cmd = new Command("simulate", "Write simulated exports for a plan from a known rate law (to plan runs, or to check the analysis on known answers).")
        {
            series, k, orders, coefficients, ea, tref, duration, interval, noise, seed, force, saturation, plate, drift,
        };
        cmd.SetAction(pr =>
        {
            try
            {
                var dir = pr.GetValue(series)!.FullName;
                var config = SeriesConfig.FromFile(Path.Combine(dir, "series.toml"));
                config = config with { Signal = config.Signal.WithFilesFrom(dir) };
                // plan.csv, or the plate maps of a [plate] table: the plan analyse will read
                var (read, problems) = SeriesPlan.Read(dir, config, new AnalysisOptions());
                if (problems.Count > 0) throw new InputException(problems[0]);
                var plan = read!;
                var ord = Pairs(pr.GetValue(orders) ?? [], "--order");
                // The followed species' coefficient is the one series.toml states; the analysis reads it from there too.
                var nu = ord.Keys.ToDictionary(s => s, s => s == config.Signal.Species ? config.Signal.Coefficient : -1.0);
                foreach (var (s, v) in Pairs(pr.GetValue(coefficients) ?? [], "--coefficient")) nu[s] = v;
                var law = new SimulatedLaw(pr.GetValue(k), ord, nu, pr.GetValue(ea) * 1000, pr.GetValue(tref) + 273.15);
                if (pr.GetValue(saturation) is { } satText)
                {
                    var (satSpecies, km) = Pairs([satText], "--saturation").Single();
                    if (!(km > 0)) throw new FormatException("--saturation expects a positive Km in mmol/L");
                    law = law with { SaturationSpecies = satSpecies, SaturationConstant = km / 1000 };
                    if (!nu.ContainsKey(satSpecies)) nu[satSpecies] = satSpecies == config.Signal.Species ? config.Signal.Coefficient : -1.0;
                }
                else if (ord.Count == 0) throw new FormatException("give the law's orders (--order A=1) or a saturation (--saturation S=0.4)");
                if (pr.GetValue(plate) is not (96 or 384)) throw new FormatException("--plate expects 96 or 384");
                var sampling = new SamplingPlan(pr.GetValue(duration), pr.GetValue(interval), pr.GetValue(noise), pr.GetValue(seed));
                if (!(sampling.Duration > 0 && sampling.Interval > 0 && sampling.Interval <= sampling.Duration))
                {
                    Console.Error.WriteLine("tracekin simulate: --duration and --interval must be positive, interval ≤ duration");
                    return ExitCodes.Usage;
                }
                var existing = plan.Rows.Select(r => r.File).Distinct(StringComparer.Ordinal).Where(f => File.Exists(Path.Combine(dir, f)) || Directory.Exists(Path.Combine(dir, f))).ToList();
                if (existing.Count > 0 && !pr.GetValue(force))
                {
                    Console.Error.WriteLine($"tracekin simulate: {existing.Count} export file(s) named in plan.csv already exist in {dir} ({string.Join(", ", existing.Take(5))}{(existing.Count > 5 ? ", …" : "")}); nothing was written. Pass --force to overwrite them, or simulate into a copy of the plan and series.toml.");
                    return ExitCodes.Usage;
                }
                // Rows that read a channel of a shared file are wells of one plate export (grid layout); others get a file each.
                var (plateRows, plateColumns) = pr.GetValue(plate) == 384 ? (16, 24) : (8, 12);
                foreach (var group in plan.Rows.GroupBy(r => r.File, StringComparer.Ordinal))
                {
                    if (group.Any(r => r.Channel is not null))
                        AtomicFile.WriteAllText(Path.Combine(dir, group.Key), SampleWriter.PlateText(group.ToList(), config, law, sampling, plateRows, plateColumns, pr.GetValue(drift)));
                    else
                        foreach (var row in group) AtomicFile.WriteAllText(Path.Combine(dir, row.File), SampleWriter.ExportText(row, config, law, sampling));
                    Console.Error.WriteLine($"  wrote {group.Key}");
                }
                return ExitCodes.Ok;
            }
            catch (InputException ex)
            {
                Console.Error.WriteLine($"tracekin simulate: {ex.Problem.Message}");
                return ExitCodes.Usage;
            }
            catch (FormatException ex)
            {
                Console.Error.WriteLine($"tracekin simulate: {ex.Message}");
                return ExitCodes.Usage;
            }
        });
        return cmd;
    }

    private static Dictionary<string, double> Pairs(IEnumerable<string> items, string option)
    {
        var d = new Dictionary<string, double>(StringComparer.Ordinal);
        foreach (var item in items)
        {
            var eq = item.IndexOf('=');
            if (eq <= 0 || !double.TryParse(item.AsSpan(eq + 1), NumberStyles.Float, CultureInfo.InvariantCulture, out var v))
                throw new FormatException($"{option} expects SPECIES=NUMBER, found \"{item}\"");
            d[item[..eq].Trim()] = v;
        }
        return d;
    }
}
