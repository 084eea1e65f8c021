using TraceKin.Analysis;
using System.CommandLine;
using System.Globalization;
using TraceKin.Ingest;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Cli.Commands;

/// <summary>
/// `tracekin inspect FILE…`: reads each export as `analyse` would and prints what was detected — encoding, delimiter,
/// decimal separator, preamble metadata, columns with quantity and unit, points, time span and sampling interval,
/// warnings — or the located reason it was rejected. Exit 0 when every file was read, 2 when some were rejected.
/// </summary>
public static class InspectCommand
{
    public static Command Create()
    {
        var files = new Argument<FileInfo[]>("files") { Description = "Export files to read.", Arity = ArgumentArity.OneOrMore };
        var settings = new Option<FileInfo?>("--settings", "-s")
        {
            Description = "series.toml whose [ingest] table forces format decisions (default: series.toml beside each file, when present).",
        };
        var cmd = new Command("inspect", "Show how TraceKin reads instrument exports: detected format, columns, units, time span, warnings.")
        {
            files, settings,
        };
        cmd.SetAction(pr => Run(pr.GetValue(files) ?? [], pr.GetValue(settings), Console.Out));
        return cmd;
    }

    public static int Run(IReadOnlyList<FileInfo> files, FileInfo? settingsFile, TextWriter output)
    {
        if (settingsFile is { Exists: false })
        {
            output.WriteLine($"tracekin: settings file not found: {settingsFile.FullName}");
            return ExitCodes.Usage;
        }
        var rejected = 0;
        foreach (var file in files)
        {
            output.WriteLine(Shown(file.Name));
            try
            {
                var (settings, source) = SettingsFor(file, settingsFile);
                // a plate map that series.toml's [plate] names is no export: show the plan it makes instead
                if (PlateMapOf(file, settingsFile) is { } config)
                {
                    if (!PrintMap(file, config, output)) rejected++;
                    output.WriteLine();
                    continue;
                }
                if (source is not null) output.WriteLine($"  {"settings",-20} [ingest] of {source}");
                var run = ExportReader.FromFile(file.FullName, settings);
                Print(run, output);
            }
            catch (InputException ex)
            {
                rejected++;
                output.WriteLine(Shown($"  rejected: {ex.Problem.Message}"));
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                rejected++;
                output.WriteLine(Shown($"  rejected: {file.Name}: could not be read ({ex.Message})"));
            }
            output.WriteLine();
        }
        output.WriteLine($"{files.Count - rejected} of {files.Count} file{(files.Count == 1 ? "" : "s")} read, {rejected} rejected");
        return rejected == 0 ? ExitCodes.Ok : ExitCodes.SomeRejected;
    }

    private static (IngestSettings Settings, string? Source) SettingsFor(FileInfo file, FileInfo? explicitFile)
    {
        var path = explicitFile?.FullName ?? Path.Combine(file.DirectoryName ?? ".", "series.toml");
        if (!File.Exists(path)) return (IngestSettings.Default, null);
        return (SeriesConfig.FromFile(path).Ingest, Path.GetFileName(path));
    }

    /// <summary>The series settings beside the file when their [plate] table names it as a map; null otherwise.</summary>
    private static SeriesConfig? PlateMapOf(FileInfo file, FileInfo? explicitFile)
    {
        var path = explicitFile?.FullName ?? Path.Combine(file.DirectoryName ?? ".", "series.toml");
        if (!File.Exists(path) || Path.GetDirectoryName(Path.GetFullPath(path)) != file.DirectoryName) return null;
        var config = SeriesConfig.FromFile(path);
        return config.Plate is { } plate && plate.Maps.Contains(file.Name, StringComparer.Ordinal) ? config : null;
    }

    /// <summary>The plan a [plate] series' maps make, as analyse builds it: its runs, and every located problem. False when there is a problem.</summary>
    private static bool PrintMap(FileInfo file, SeriesConfig config, TextWriter o)
    {
        var plate = config.Plate!;
        o.WriteLine(Shown($"  {"plate map",-20} one of the maps of [plate] in series.toml ({string.Join(", ", plate.Maps)})"));
        var (plan, problems) = SeriesPlan.Read(file.DirectoryName ?? ".", config, new AnalysisOptions());
        if (plan is not null)
        {
            var rows = plan.Rows;
            o.WriteLine(Shown($"  {"runs",-20} {rows.Count} ({rows[0].Run} … {rows[^1].Run}), reading {string.Join(", ", rows.Select(r => r.File).Distinct(StringComparer.Ordinal))}"));
            o.WriteLine(Shown($"  {"roles",-20} {rows.Count(r => r.Role == "sample")} sample, {rows.Count(r => r.Role == "blank")} blank"));
            if (plan.Species.Count > 0) o.WriteLine(Shown($"  {"species",-20} {string.Join(", ", plan.Species.Select(sp => $"[{sp}]0"))}"));
            var subtracting = rows.Count(r => r.BlankRuns.Count > 0);
            if (subtracting > 0) o.WriteLine(Shown($"  {"blanks",-20} {subtracting} run(s) subtract a blank"));
        }
        if (problems.Count == 0) o.WriteLine("  problems             none");
        else
        {
            o.WriteLine(plan is null ? "  rejected: no plan can be made" : "  problems (these wells are not analysed)");
            foreach (var p in problems) o.WriteLine(Shown($"    {p.Message}"));
        }
        return problems.Count == 0;
    }

    private static void Print(RunExport run, TextWriter o)
    {
        foreach (var (key, value) in run.Detected)
        {
            if (key.StartsWith("column ", StringComparison.Ordinal)) continue;
            o.WriteLine(Shown($"  {key,-20} {value}"));
        }
        if (run.Metadata.Count > 0)
        {
            o.WriteLine("  metadata");
            foreach (var (key, value) in run.Metadata) o.WriteLine(Shown($"    {key,-18} {value}"));
        }
        o.WriteLine("  columns");
        foreach (var (key, value) in run.Detected.Where(d => d.Key.StartsWith("column ", StringComparison.Ordinal)))
            o.WriteLine(Shown($"    {key["column ".Length..],-18} {value}"));
        o.WriteLine("  traces");
        foreach (var t in run.Channels) o.WriteLine(Shown("    " + Describe(t, "channel")));
        foreach (var t in run.Auxiliary) o.WriteLine(Shown("    " + Describe(t, "auxiliary")));
        if (run.Warnings.Count == 0) o.WriteLine("  warnings             none");
        else
        {
            o.WriteLine("  warnings");
            foreach (var w in run.Warnings) o.WriteLine(Shown($"    [{w.Code}] {w}"));
        }
    }

    /// <summary>A line of input text (headers, metadata, names) with control characters shown as visible escapes.</summary>
    private static string Shown(string line) => PrintableText.Escape(line);

    private static string Describe(Trace t, string role)
    {
        var inv = CultureInfo.InvariantCulture;
        var span = t.Count > 0 ? $"{t.Times[0].ToString("G6", inv)} to {t.Times[^1].ToString("G6", inv)} s" : "no points";
        var unit = t.Unit.Length == 0 ? "no unit" : t.Unit;
        var source = t.SourceUnit is { Length: > 0 } s && s != t.Unit ? $" (read in {s})" : "";
        return $"{t.Name,-18} {role,-9} {Units.Describe(t.Quantity),-13} {unit}{source}; {t.Count} point{(t.Count == 1 ? "" : "s")}, {span}, {Interval(t.Times)}";
    }

    /// <summary>The median step between samples, and whether the steps are even.</summary>
    private static string Interval(double[] times)
    {
        if (times.Length < 2) return "no interval";
        var steps = new double[times.Length - 1];
        for (var k = 1; k < times.Length; k++) steps[k - 1] = times[k] - times[k - 1];
        Array.Sort(steps);
        var median = steps[steps.Length / 2];
        var even = steps[^1] - steps[0] <= 1e-6 * Math.Max(1, Math.Abs(median));
        return $"every {median.ToString("G6", CultureInfo.InvariantCulture)} s{(even ? "" : $" (median; steps {steps[0].ToString("G4", CultureInfo.InvariantCulture)} to {steps[^1].ToString("G4", CultureInfo.InvariantCulture)} s)")}";
    }
}
