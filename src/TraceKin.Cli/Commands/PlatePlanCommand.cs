using System.CommandLine;
using TraceKin.Reports;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Cli.Commands;

/// <summary>
/// `tracekin plate-plan MAP… --export FILE`: turns plate-map grids (one grid per plan column, laid out as the plate)
/// into plan.csv, one row per mapped well with its channel, so a plate's plan is drawn rather than typed.
/// </summary>
public static class PlatePlanCommand
{
    public static Command Create()
    {
        var maps = new Argument<FileInfo[]>("maps") { Description = "Plate-map CSV files: each grid's corner cell names the plan column it fills.", Arity = ArgumentArity.OneOrMore };
        var export = new Option<string?>("--export", "-e") { Description = "The plate export every well is read from (its file name in the series folder); may be left out when a \"file\" grid names each well's export." };
        var output = new Option<FileInfo?>("--out", "-o") { Description = "plan.csv to write (default: plan.csv beside the first map)." };
        var prefix = new Option<string>("--prefix") { Description = "Text put before each well's name to make its run id (default none: run B7 reads well B7).", DefaultValueFactory = _ => "" };
        var force = new Option<bool>("--force") { Description = "Replace an existing plan.csv." };
        var cmd = new Command("plate-plan", "Write plan.csv from plate-map grids: one run per mapped well, its channel the well.")
        {
            maps, export, output, prefix, force,
        };
        cmd.SetAction(pr => Run(pr.GetValue(maps) ?? [], pr.GetValue(export), pr.GetValue(output), pr.GetValue(prefix) ?? "", pr.GetValue(force), Console.Out, Console.Error));
        return cmd;
    }

    public static int Run(IReadOnlyList<FileInfo> maps, string? export, FileInfo? output, string prefix, bool force, TextWriter stdout, TextWriter stderr)
    {
        var missing = maps.FirstOrDefault(m => !m.Exists);
        if (missing is not null)
        {
            stderr.WriteLine(PrintableText.Escape($"tracekin plate-plan: no such file: {missing.FullName}"));
            return ExitCodes.Usage;
        }
        var target = output?.FullName ?? Path.Combine(maps[0].DirectoryName ?? ".", "plan.csv");
        if (File.Exists(target) && !force)
        {
            stderr.WriteLine(PrintableText.Escape($"tracekin plate-plan: {target} exists; nothing was written (pass --force to replace it)"));
            return ExitCodes.Usage;
        }
        PlateMap map;
        try { map = PlateMap.FromTexts(maps.Select(m => (m.Name, File.ReadAllText(m.FullName)))); }
        catch (InputException ex)
        {
            stderr.WriteLine(PrintableText.Escape($"tracekin plate-plan: {ex.Problem.Message}"));
            return ExitCodes.SomeRejected;
        }
        if (export is null && !map.Columns.Contains("file", StringComparer.OrdinalIgnoreCase))
        {
            stderr.WriteLine("tracekin plate-plan: give the plate export with --export FILE (the map has no \"file\" grid naming each well's export)");
            return ExitCodes.Usage;
        }
        var text = map.ToPlanText(export, prefix);
        // The plan written must read back: a bad value in a map (a concentration that is not a number) is located
        // now, at its map cell, by the same code that builds the plan in memory for a series with a [plate] table.
        try
        {
            if (map.ToPlan(export, prefix, Path.GetFileName(target)).Problems is [var first, ..])
            {
                stderr.WriteLine(PrintableText.Escape($"tracekin plate-plan: {first.Message}"));
                return ExitCodes.SomeRejected;
            }
        }
        catch (InputException ex)
        {
            stderr.WriteLine(PrintableText.Escape($"tracekin plate-plan: {ex.Problem.Message}"));
            return ExitCodes.SomeRejected;
        }
        AtomicFile.WriteAllText(target, text);
        stdout.WriteLine(PrintableText.Escape($"wrote {target}: {map.Wells.Count} runs from a {map.Rows} × {map.ColumnCount} map ({string.Join(", ", map.Columns)})"));
        return ExitCodes.Ok;
    }
}
