using System.Diagnostics;
using System.Text;
using TraceKin.Analysis;
using TraceKin.Tests.Watch;

namespace TraceKin.Tests.Analysis;

/// <summary>
/// A temporary folder holding a series folder with four good invented runs (R001–R004, round-trip data from
/// <see cref="SeriesFixture"/>) and, beside it, a folder "outside" with a valid export that no plan should reach.
/// Extra plan rows name the probe files.
/// </summary>
internal sealed class ProbeSeries : IDisposable
{
    public const int GoodRuns = 4;

    public string Root { get; } = SeriesFixture.TempFolder("inputs");
    public string Folder => Path.Combine(Root, "series");
    public string Outside => Path.Combine(Root, "outside");
    public string Secret => Path.Combine(Outside, "secret.csv");

    public ProbeSeries()
    {
        Directory.CreateDirectory(Folder);
        Directory.CreateDirectory(Outside);
        var (config, plan) = SeriesFixture.Parse(GoodRuns + 1);
        File.WriteAllText(Path.Combine(Folder, "series.toml"), SeriesFixture.GoodToml);
        for (var i = 1; i <= GoodRuns; i++)
            File.WriteAllText(Path.Combine(Folder, SeriesFixture.FileOf(i)), SeriesFixture.ExportText(plan, config, i, seed: i));
        File.WriteAllText(Secret, SeriesFixture.ExportText(plan, config, GoodRuns + 1, seed: 99));
        PlanRows();
    }

    /// <summary>The good rows, then one row per extra file: run ids R005, R006, … on lines 6, 7, ….</summary>
    public void Plan(params string[] files) => PlanRows(files.Select((f, k) => ($"R{GoodRuns + 1 + k:000}", f)).ToArray());

    public void PlanRows(params (string Run, string File)[] rows)
    {
        var sb = new StringBuilder(SeriesFixture.PlanText(GoodRuns));
        foreach (var (run, file) in rows) sb.Append($"{run},{file},25.0,0.4,100\n");
        File.WriteAllText(Path.Combine(Folder, "plan.csv"), sb.ToString());
    }

    public string Write(string name, string text)
    {
        var path = Path.Combine(Folder, name);
        File.WriteAllText(path, text);
        return path;
    }

    /// <summary>A valid export's text (run 5 of the fixture), to be damaged by a test.</summary>
    public string ExportText()
    {
        var (config, plan) = SeriesFixture.Parse(GoodRuns + 1);
        return SeriesFixture.ExportText(plan, config, GoodRuns + 1, seed: 5);
    }

    public SeriesResult Analyse(bool allowOutside = false) =>
        SeriesRunner.Analyse(Folder, new AnalysisOptions { Workers = 1, AllowOutsideFiles = allowOutside });

    /// <summary>
    /// Analyses on another thread and fails, instead of hanging the test run, if that takes longer than a minute: a
    /// guard against an open that blocks, not a speed check (the analysis takes well under a second).
    /// </summary>
    public SeriesResult AnalyseGuarded(bool allowOutside = false, string? fifoToRelease = null)
    {
        var task = Task.Run(() => Analyse(allowOutside));
        if (!task.Wait(TimeSpan.FromMinutes(1)))
        {
            // unblock a reader stuck in open(2) on the pipe, so the test process can end
            if (fifoToRelease is not null) using (new FileStream(fifoToRelease, FileMode.Open, FileAccess.Write)) { }
            Assert.Fail("the analysis did not return within a minute: an open blocked");
        }
        return task.Result;
    }

    /// <summary>Makes a named pipe with mkfifo(1); null (and the reason) when mkfifo cannot be run here.</summary>
    public static string? MakeFifo(string path, out string reason)
    {
        reason = "";
        try
        {
            using var p = Process.Start(new ProcessStartInfo("mkfifo", [path]) { RedirectStandardError = true, UseShellExecute = false })!;
            var err = p.StandardError.ReadToEnd();
            p.WaitForExit();
            if (p.ExitCode == 0) return path;
            reason = $"mkfifo exited with {p.ExitCode}: {err.Trim()}";
        }
        catch (System.ComponentModel.Win32Exception ex)
        {
            reason = $"mkfifo is not available ({ex.Message})";
        }
        return null;
    }

    /// <summary>Every good run was still analysed.</summary>
    public static void AssertGoodRunsAnalysed(SeriesResult result) =>
        Assert.Equal(Enumerable.Range(1, GoodRuns).Select(i => $"R{i:000}"), result.Runs.Select(r => r.Id).Where(id => string.CompareOrdinal(id, $"R{GoodRuns:000}") <= 0));

    public void Dispose()
    {
        try { Directory.Delete(Root, recursive: true); }
        catch (IOException) { }
    }
}
