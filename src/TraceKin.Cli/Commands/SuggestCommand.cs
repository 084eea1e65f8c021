using TraceKin.Analysis;
using System.CommandLine;
using System.Globalization;
using TraceKin.Planning;
using TraceKin.Reports;
using TraceKin.Series;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Cli.Commands;

/// <summary>
/// `tracekin suggest [SOURCE] --out DIR --runs N --range X=LOW..HIGH …`: proposes the next runs of a series by optimal
/// design on its fitted law (or on prior guesses for a new study), checks them by simulation and writes plan.csv for
/// them plus suggestion.txt. The science is in TraceKin.Planning; this file only reads options and writes files.
/// </summary>
public static class SuggestCommand
{
    public static Command Create()
    {
        var source = new Argument<FileSystemInfo?>("source") { Description = "summary.json from analyse, a folder holding it, or a series folder (analysed in memory). Leave out for a new study (then --law, --guess, --noise).", Arity = ArgumentArity.ZeroOrOne };
        var output = new Option<DirectoryInfo>("--out", "-o") { Description = "Folder for plan.csv (the new runs) and suggestion.txt.", Required = true };
        var runs = new Option<int>("--runs") { Description = "Number of new runs.", Required = true };
        var replicates = new Option<int>("--replicates") { Description = "Identical runs per proposed condition (default 1; must divide --runs).", DefaultValueFactory = _ => 1 };
        var ranges = new Option<string[]>("--range") { Description = "Allowed starting concentrations of a species, SPECIES=LOW..HIGH [UNIT], e.g. \"A=0.1..2 mmol/L\" (unit default: the plan's column, else mmol/L). Species without one are held at their median level.", AllowMultipleArgumentsPerToken = false };
        var temperature = new Option<string?>("--temperature-range") { Description = "Allowed temperatures, LOW..HIGH in °C (or with a trailing K). Needs an Arrhenius fit in the series or --guess Ea." };
        var criterion = new Option<string>("--criterion") { Description = "d (D-optimal, default) or variance:NAME for one parameter, e.g. variance:n(A), variance:Ea, variance:Km.", DefaultValueFactory = _ => "d" };
        var law = new Option<string?>("--law") { Description = "power or saturation (default: the law the series chose; power for a new study)." };
        var substrate = new Option<string?>("--substrate") { Description = "New study, saturation law: the species it saturates in." };
        var guesses = new Option<string[]>("--guess") { Description = "A parameter's value, NAME=VALUE: k, n(SPECIES), Ea (kJ/mol), Vmax, Km (mol/L, or with a unit). Overrides the series' fit; a new study needs every parameter." };
        var noise = new Option<double?>("--noise") { Description = "Standard error of one initial rate, mol/(L·s), the same for every run (default: fitted to the series' runs)." };
        var relNoise = new Option<double?>("--relative-noise") { Description = "Relative standard error of one initial rate, e.g. 0.02 for 2 % (instead of --noise)." };
        var tref = new Option<double>("--reference-temperature") { Description = "New study over temperature: the temperature (°C) at which --guess k is given (default 25).", DefaultValueFactory = _ => 25.0 };
        var plan = new Option<FileInfo?>("--plan") { Description = "The series' plan.csv (columns, units and run ids of the new plan; default: the series folder's)." };
        var draws = new Option<int>("--draws") { Description = "Simulated series per design for the check (at least 200; default 200).", DefaultValueFactory = _ => 200 };
        var seed = new Option<int>("--seed") { Description = "Random seed of the simulation check (default 1).", DefaultValueFactory = _ => 1 };
        var cmd = new Command("suggest", "Propose the next runs of a series by optimal design (D-optimal or one parameter's variance), checked by simulation; writes plan.csv for them.")
        {
            source, output, runs, replicates, ranges, temperature, criterion, law, substrate, guesses, noise, relNoise, tref, plan, draws, seed,
        };
        cmd.SetAction(pr => Run(new SuggestOptions(pr.GetValue(source), pr.GetValue(output)!, pr.GetValue(runs))
        {
            Replicates = pr.GetValue(replicates), Ranges = pr.GetValue(ranges) ?? [], TemperatureRange = pr.GetValue(temperature),
            Criterion = pr.GetValue(criterion)!, Law = pr.GetValue(law), Substrate = pr.GetValue(substrate), Guesses = pr.GetValue(guesses) ?? [],
            Noise = pr.GetValue(noise), RelativeNoise = pr.GetValue(relNoise), ReferenceTemperatureC = pr.GetValue(tref), Plan = pr.GetValue(plan),
            Draws = pr.GetValue(draws), Seed = pr.GetValue(seed),
        }, Console.Out, Console.Error));
        return cmd;
    }

    /// <summary>Runs the command with its options; every bad input is a located message on <paramref name="error"/> and exit 1.</summary>
    public static int Run(SuggestOptions o, TextWriter output, TextWriter error)
    {
        try { return Execute(o, output, error); }
        catch (InputException ex)
        {
            error.WriteLine($"tracekin suggest: {ex.Problem.Message}");
            return ExitCodes.Usage;
        }
    }

    private static int Execute(SuggestOptions o, TextWriter stdout, TextWriter stderr)
    {
        var (source, output, runs, replicates, rangeTexts, temperatureText) = (o.Source, o.Out, o.Runs, o.Replicates, o.Ranges, o.TemperatureRange);
        var (criterionText, lawText, substrate, guessTexts, noise, relNoise) = (o.Criterion, o.Law, o.Substrate, o.Guesses, o.Noise, o.RelativeNoise);
        var (trefC, planFile, draws, seed) = (o.ReferenceTemperatureC, o.Plan, o.Draws, o.Seed);
        const string cl = PlanningSetup.CommandLine;
        var ci = CultureInfo.InvariantCulture;
        if (draws < 200) throw Fail.Setting(cl, "--draws", draws.ToString(ci), "at least 200 simulated series per design");
        var crit = DesignCriterion.Parse(criterionText) ?? throw Fail.Setting(cl, "--criterion", Fail.Quote(criterionText), "d or variance:NAME, e.g. variance:n(A)");
        if (lawText is not null && lawText is not (ModelSettings.Power or ModelSettings.Saturation))
            throw Fail.Setting(cl, "--law", Fail.Quote(lawText), "power or saturation");
        if (noise is not null && relNoise is not null) throw Fail.Setting(cl, "--relative-noise", "both --noise and --relative-noise", "one of them");
        if (noise is { } n0 && !(n0 > 0 && double.IsFinite(n0))) throw Fail.Setting(cl, "--noise", n0.ToString("G6", ci), "a standard error above 0 in mol/(L·s)");
        if (relNoise is { } r0 && !(r0 > 0 && r0 < 1)) throw Fail.Setting(cl, "--relative-noise", r0.ToString("G6", ci), "a fraction above 0 and below 1, e.g. 0.02");

        // The source: summary.json, a folder holding it, or a series folder analysed in memory.
        AnalysedSeries? series = null;
        string? planPath = planFile?.FullName;
        var summaryName = SummaryJson.FileName;
        if (source is not null)
        {
            if (source is DirectoryInfo dir && dir.Exists)
            {
                var summary = Path.Combine(dir.FullName, SummaryJson.FileName);
                var seriesPlan = Path.Combine(dir.FullName, "plan.csv");
                if (File.Exists(summary)) series = AnalysedSeries.FromSummary(summary, SettingsBeside(planPath));
                else if (File.Exists(seriesPlan))
                {
                    planPath ??= seriesPlan;
                    stderr.WriteLine($"  analysing {dir.FullName} in memory (nothing is written there)");
                    series = AnalysedSeries.FromFolder(dir.FullName);
                }
                else throw Fail.At(dir.FullName, 1, 1, "a folder with neither summary.json nor plan.csv", "summary.json from tracekin analyse, or a series folder");
            }
            else if (source is FileInfo { Exists: true } file)
            {
                summaryName = file.Name;
                series = AnalysedSeries.FromSummary(file.FullName, SettingsBeside(planPath));
            }
            else throw Fail.At(source.FullName, 1, 1, "no such file or folder", "summary.json from tracekin analyse, or a series folder");
        }
        var planText = planPath is null ? null : File.ReadAllText(planPath);
        var existingPlan = planPath is null ? null : Plan.FromText(planText!, Path.GetFileName(planPath));

        UnitInfo DefaultUnit(string sp) => SuggestedPlan.ConcentrationUnit(planText, sp) ?? Units.Find("mmol/L")!;
        var ranges = rangeTexts.Select(t => LimitText.Range(t, DefaultUnit)).ToList();
        (double Low, double High)? trange = temperatureText is null ? null : LimitText.TemperatureRange(temperatureText);
        var guess = new Dictionary<string, double>(StringComparer.Ordinal);
        foreach (var g in guessTexts)
        {
            var (name, v) = LimitText.Guess(g);
            guess[name] = v;
        }
        var moves = trange is { } tr && tr.High > tr.Low;

        DesignLaw designLaw;
        double[] theta;
        RateNoise rateNoise;
        IReadOnlyList<RunPoint> existing;
        var settings = series?.Settings ?? ModelSettings.Default;
        if (series is not null)
        {
            (designLaw, theta) = PlanningSetup.FromSeries(series, lawText, guess, moves, summaryName);
            rateNoise = noise is { } n ? RateNoise.Constant(n) : relNoise is { } r ? RateNoise.Relative(r) : RateNoise.FromRuns(series.Runs);
            existing = series.Runs;
        }
        else
        {
            if (ranges.Count == 0) throw Fail.Setting(cl, "--range", "no range", "a --range for every species of the law in a new study");
            (designLaw, theta) = PlanningSetup.FromGuesses(lawText ?? ModelSettings.Power, ranges.Select(x => x.Species).ToArray(), substrate, guess, moves, trefC + 273.15);
            rateNoise = noise is { } n ? RateNoise.Constant(n) : relNoise is { } r ? RateNoise.Relative(r)
                : throw Fail.Setting(cl, "--noise", "no noise", "the standard error of one initial rate (--noise, mol/(L·s)) or its relative error (--relative-noise) for a new study");
            existing = [];
            if (designLaw.Law == ModelSettings.Saturation) settings = new ModelSettings { Substrate = substrate ?? ranges[0].Species };
        }
        if (crit.Parameter is { } cp && designLaw.IndexOf(cp) < 0)
            throw Fail.Setting(cl, "--criterion", Fail.Quote(criterionText), $"variance of a parameter of the {designLaw.Law} law: {string.Join(", ", designLaw.ParameterNames.Select(p => "variance:" + p))}");
        var limits = new PlanningLimits(ranges, trange?.Low, trange?.High, runs, replicates);
        var space = PlanningSetup.Space(limits, designLaw, existing, trefC + 273.15);
        var request = new PlanningRequest(designLaw, theta, rateNoise, existing, space, runs, crit)
        {
            Replicates = replicates, Settings = settings, Draws = draws, Seed = seed,
        };
        var suggestion = RunPlanner.Suggest(request);

        var ids = existingPlan?.Rows.Select(x => x.Run).ToList() ?? existing.Select(x => x.RunId).ToList();
        var files = existingPlan?.Rows.Select(x => x.File).ToList() ?? [];
        var speciesOut = existingPlan?.Species ?? existing.SelectMany(x => x.InitialConcentrations.Keys).Union(designLaw.Species).Distinct().OrderBy(s => s, StringComparer.Ordinal).ToList();
        var csv = SuggestedPlan.Text(suggestion.NewRuns, ids, files, speciesOut, planText);
        var newIds = SuggestedPlan.NextIds(ids, suggestion.NewRuns.Count);
        var text = SuggestionText.Format(suggestion, newIds);
        var outDir = output.FullName;
        try
        {
            SuggestedPlan.Write(outDir, csv);
            AtomicFile.WriteAllText(Path.Combine(outDir, SuggestionText.FileName), text, outDir);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            stderr.WriteLine($"tracekin suggest: cannot write to --out {outDir}: {ex.Message}");
            return ExitCodes.CannotWrite;
        }
        stdout.Write(text);
        stderr.WriteLine($"  wrote {Path.Combine(outDir, SuggestedPlan.FileName)} and {SuggestionText.FileName}");
        return ExitCodes.Ok;
    }

    /// <summary>The [model] settings of the series.toml beside the plan, when there is one (the fit the series reported).</summary>
    private static ModelSettings? SettingsBeside(string? planPath)
    {
        if (planPath is null) return null;
        var toml = Path.Combine(Path.GetDirectoryName(planPath)!, "series.toml");
        return File.Exists(toml) ? SeriesConfig.FromFile(toml).Model : null;
    }
}

/// <summary>The options of `tracekin suggest`, as typed (limits and guesses are read by TraceKin.Planning.LimitText).</summary>
public sealed record SuggestOptions(FileSystemInfo? Source, DirectoryInfo Out, int Runs)
{
    public int Replicates { get; init; } = 1;
    public string[] Ranges { get; init; } = [];
    public string? TemperatureRange { get; init; }
    public string Criterion { get; init; } = "d";
    public string? Law { get; init; }
    public string? Substrate { get; init; }
    public string[] Guesses { get; init; } = [];
    public double? Noise { get; init; }
    public double? RelativeNoise { get; init; }
    public double ReferenceTemperatureC { get; init; } = 25;
    public FileInfo? Plan { get; init; }
    public int Draws { get; init; } = 200;
    public int Seed { get; init; } = 1;
}
