using TraceKin.Analysis;
using TraceKin.Reports;

namespace TraceKin.Cli.Watch;

/// <summary>
/// Draws a run's plot only when something it depends on changed (the export's content, plan.csv or the plate maps, series.toml or
/// the tool version) or the picture is missing, so re-analysing a series after one new export redraws one plot,
/// not all — also after a restart. What each plot was drawn from is kept in a small key file beside the snapshot,
/// written after the picture, so a kill in between only costs one redraw. A plot that cannot be drawn or written (any
/// exception) is handed to <paramref name="outputs"/>, which lists it in the report and returns it with the
/// pass's other failures; it is never thrown. Every file goes through <see cref="AtomicFile"/> inside the watcher's
/// output folder <paramref name="root"/>.
/// </summary>
/// <param name="plot">The outputs' run plot, writing each picture before it returns.</param>
public sealed class ChangedRunPlots(string root, string outDir, string keyDir, IReadOnlyDictionary<string, string> inputs, RunPlot plot, SeriesOutputs outputs) : IRunSink
{
    /// <summary>The plate maps the plan is built from ([plate]): a plot depends on them as on plan.csv.</summary>
    public IReadOnlyList<string> Maps { get; init; } = [];

    public void Begin(TraceKin.Setup.Plan plan) => plot.Begin(plan);

    public void Accept(RunResult run)
    {
        var name = plot.FileNameOf(run.Id);
        var png = Path.Combine(outDir, "plots", name);
        var keyFile = Path.Combine(keyDir, name + ".key");
        var key = string.Join(' ', [run.InputSha256, inputs.GetValueOrDefault(SeriesRunner.PlanFile), inputs.GetValueOrDefault(SeriesRunner.ConfigFile),
            .. Maps.Select(m => inputs.GetValueOrDefault(m)), SeriesRunner.ToolVersion]);
        try
        {
            if (File.Exists(png) && new FileInfo(png).LinkTarget is null && File.Exists(keyFile) && new FileInfo(keyFile).LinkTarget is null
                && File.ReadAllText(keyFile) == key) return;
            plot.Accept(run);
            AtomicFile.WriteAllText(keyFile, key, root);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            outputs.Failed($"{SeriesOutputs.PlotFolder}/{name}", ex);
        }
    }
}
