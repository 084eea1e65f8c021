using System.Globalization;
using System.Text.Json;
using CsvHelper;
using TraceKin.Cli;
using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

/// <summary>
/// runs.csv and the per-run tables, written by `analyse` (tables streamed as the runs finish), read back with
/// CsvHelper's reader (an RFC 4180 reader independent of our writer's code) must hold exactly the numbers and texts
/// of summary.json (round trip on the invented demo series; numbers compared bit for bit). The plan's free-text
/// column carries cells a spreadsheet would run as formulas, which must come back neutralised (OWASP, "CSV Injection":
/// a leading apostrophe).
/// </summary>
public sealed class CsvTablesRoundTripTests : IDisposable
{
    private static readonly string[] Operators = ["=1+1", "+x", "-y", "@z", "has, comma", "say \"hi\"", "two\nlines", "MK"];
    private readonly RepoPaths.TempDir _series = RepoPaths.CopyOf(RepoPaths.Sample("violet-complex-acid"));
    private readonly RepoPaths.TempDir _out = new();
    private readonly RepoPaths.TempDir _outComma = new();

    public CsvTablesRoundTripTests()
    {
        var plan = File.ReadAllLines(Path.Combine(_series.Path, "plan.csv"));
        for (var i = 1; i < plan.Length; i++)
            plan[i] = plan[i][..plan[i].LastIndexOf(',')] + "," + Quote(Operators[i - 1]);
        File.WriteAllText(Path.Combine(_series.Path, "plan.csv"), string.Join("\n", plan) + "\n");
        // Two spikes in run R2 (+0.2 absorbance, far beyond its noise), so the spikes table has rows to check.
        var r2 = File.ReadAllLines(Path.Combine(_series.Path, "r2.csv"));
        foreach (var line in new[] { 120, 240 })
        {
            var cells = r2[line].Split(',');
            cells[1] = (double.Parse(cells[1], CultureInfo.InvariantCulture) + 0.2).ToString("0.000000", CultureInfo.InvariantCulture);
            r2[line] = string.Join(",", cells);
        }
        File.WriteAllText(Path.Combine(_series.Path, "r2.csv"), string.Join("\n", r2) + "\n");
        Assert.Equal(ExitCodes.Ok, Program.BuildRoot().Parse(["analyse", _series.Path, "--out", _out.Path, "--no-plots", "--workers", "2"]).Invoke());
        Assert.Equal(ExitCodes.Ok, Program.BuildRoot().Parse(["analyse", _series.Path, "--out", _outComma.Path, "--no-plots", "--decimal-comma"]).Invoke());
    }

    private static string Quote(string s) => s.IndexOfAny([',', '"', '\n']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;

    public void Dispose()
    {
        _series.Dispose();
        _out.Dispose();
        _outComma.Dispose();
    }

    private JsonElement Summary() => JsonDocument.Parse(File.ReadAllText(Path.Combine(_out.Path, SummaryJson.FileName))).RootElement;

    /// <summary>A table read with CsvHelper: its header and every row as strings.</summary>
    private static (string[] Header, List<string[]> Rows) Read(string path, char separator = ',')
    {
        using var reader = CsvReader.FromFile(path, new CsvReaderOptions { Separator = separator, HasHeader = false });
        var rows = new List<string[]>();
        while (reader.Read())
            rows.Add(Enumerable.Range(0, reader.FieldCount).Select(reader.GetString).ToArray());
        Assert.All(rows, r => Assert.Equal(rows[0].Length, r.Length));
        return (rows[0], rows.Skip(1).ToList());
    }

    /// <summary>A number cell against a summary.json number (null there for a number that is not finite: empty here).</summary>
    private static void SameNumber(JsonElement expected, string cell, IFormatProvider? numbers = null)
    {
        if (expected.ValueKind == JsonValueKind.Null) { Assert.Equal("", cell); return; }
        var v = double.Parse(cell, NumberStyles.Float, numbers ?? CultureInfo.InvariantCulture);
        Assert.Equal(BitConverter.DoubleToInt64Bits(expected.GetDouble()), BitConverter.DoubleToInt64Bits(v));
    }

    private static string Bool(JsonElement e) => e.GetBoolean() ? "true" : "false";

    private static Dictionary<string, int> Columns(string[] header) => header.Select((h, i) => (h, i)).ToDictionary(x => x.h, x => x.i);

    [Fact]
    public void Runs_csv_holds_the_summary_values_and_neutralised_plan_text()
    {
        var runs = Summary().GetProperty("runs").EnumerateArray().ToList();
        var perRunK = Summary().GetProperty("rateConstantPerRun").EnumerateArray().ToDictionary(k => k.GetProperty("run").GetString()!);
        var (header, rows) = Read(Path.Combine(_out.Path, RunsCsv.FileName));
        var c = Columns(header);
        Assert.Equal(runs.Count, rows.Count);
        for (var i = 0; i < rows.Count; i++)
        {
            var (run, row) = (runs[i], rows[i]);
            var rate = run.GetProperty("initialRate");
            Assert.Equal(run.GetProperty("id").GetString(), row[c["run"]]);
            Assert.Equal(run.GetProperty("file").GetString(), row[c["file"]]);
            SameNumber(run.GetProperty("temperature"), row[c["temperature (K)"]]);
            SameNumber(run.GetProperty("initialConcentrations").GetProperty("complex"), row[c["[complex]0 (mol/L)"]]);
            SameNumber(run.GetProperty("initialConcentrations").GetProperty("H+"), row[c["[H+]0 (mol/L)"]]);
            SameNumber(rate.GetProperty("value"), row[c["initial rate (mol/(L·s))"]]);
            SameNumber(rate.GetProperty("stdError"), row[c["std error (mol/(L·s))"]]);
            Assert.Equal(rate.GetProperty("dof").GetInt32().ToString(CultureInfo.InvariantCulture), row[c["dof"]]);
            Assert.Equal(rate.GetProperty("method").GetString(), row[c["method"]]);
            SameNumber(rate.GetProperty("windowStart"), row[c["window start (s)"]]);
            SameNumber(rate.GetProperty("windowEnd"), row[c["window end (s)"]]);
            var k = perRunK[row[c["run"]]];
            SameNumber(k.GetProperty("value"), row[c["k per run"]]);
            SameNumber(k.GetProperty("stdError"), row[c["k per run std error"]]);
            Assert.Equal(string.Join("; ", run.GetProperty("warnings").EnumerateArray().Select(w => w.GetProperty("message").GetString())), row[c["warnings"]]);
        }
        // Cells a spreadsheet would run as formulas get an apostrophe; the others come back as written.
        Assert.Equal(["'=1+1", "'+x", "'-y", "'@z", "has, comma", "say \"hi\"", "two\nlines", "MK"], rows.Select(r => r[c["operator"]]));
        // Numbers are never neutralised: a negative number stays a number (none is negative here, so check the raw text).
        Assert.DoesNotContain(File.ReadAllText(Path.Combine(_out.Path, RunsCsv.FileName)), "'0");
    }

    /// <summary>The same series analysed in memory: the reference for the values only the tables carry.</summary>
    private TraceKin.Analysis.SeriesResult InMemory() => TraceKin.Analysis.SeriesRunner.Analyse(_series.Path, new TraceKin.Analysis.AnalysisOptions { Workers = 1 });

    private static void SameNumber(double? expected, string cell)
    {
        if (expected is not { } x || !double.IsFinite(x)) { Assert.Equal("", cell); return; }
        var v = double.Parse(cell, NumberStyles.Float, CultureInfo.InvariantCulture);
        Assert.Equal(BitConverter.DoubleToInt64Bits(x), BitConverter.DoubleToInt64Bits(v));
    }

    [Fact]
    public void Law_fits_and_their_parameters_hold_every_fit_and_summary_json_names_the_chosen_one()
    {
        var (fh, fits) = Read(Path.Combine(_out.Path, RunTables.FitsFile));
        var (ph, pars) = Read(Path.Combine(_out.Path, RunTables.ParametersFile));
        Assert.Equal(RunTables.FitsHeader, fh);
        Assert.Equal(RunTables.ParametersHeader, ph);
        var f = Columns(fh);
        var p = Columns(ph);
        var summary = Summary().GetProperty("runs").EnumerateArray().ToDictionary(r => r.GetProperty("id").GetString()!);
        int fi = 0, pi = 0;
        foreach (var run in InMemory().Runs)
        {
            var chosenRows = 0;
            foreach (var fit in run.Rates.Fits)
            {
                var row = fits[fi++];
                Assert.Equal(run.Id, row[f["run"]]);
                Assert.Equal(fit.Law, row[f["law"]]);
                Assert.Equal(fit.Drift ? "true" : "false", row[f["drift term"]]);
                Assert.Equal(fit.Chosen ? "true" : "false", row[f["chosen"]]);
                Assert.Equal(fit.Fit.Exit.ToString(), row[f["exit"]]);
                Assert.Equal(fit.Fit.Converged ? "true" : "false", row[f["converged"]]);
                Assert.Equal(fit.Fit.PointCount.ToString(CultureInfo.InvariantCulture), row[f["points"]]);
                Assert.Equal(fit.Fit.DegreesOfFreedom.ToString(CultureInfo.InvariantCulture), row[f["dof"]]);
                SameNumber(fit.Fit.RSquared, row[f["r squared"]]);
                SameNumber(fit.Fit.AicC, row[f["AICc"]]);
                SameNumber(fit.Fit.Bic, row[f["BIC"]]);
                SameNumber(fit.DeltaAicc, row[f["delta AICc"]]);
                SameNumber(fit.AkaikeWeight, row[f["Akaike weight"]]);
                SameNumber(fit.HalfLife, row[f["half-life (s)"]]);
                SameNumber(fit.HalfLifeStdError, row[f["half-life std error (s)"]]);
                SameNumber(fit.Runs?.PValue, row[f["runs test p"]]);
                Assert.Equal(fit.LackOfFit ? "true" : "false", row[f["lack of fit"]]);
                Assert.Equal(fit.ExcludedBecause ?? "", row[f["excluded because"]]);
                foreach (var par in fit.Fit.Parameters)
                {
                    var pr = pars[pi++];
                    Assert.Equal((run.Id, fit.Law, par.Name), (pr[p["run"]], pr[p["law"]], pr[p["parameter"]]));
                    SameNumber(par.Value, pr[p["value"]]);
                    SameNumber(par.StdError, pr[p["std error"]]);
                    Assert.Equal(par.Varied ? "true" : "false", pr[p["varied"]]);
                    // The trace is in mol/L (docs/formats.md): levels in mol/L, drift in mol/(L·s), k in the law's unit.
                    Assert.Equal(par.Name switch { "k" => fit.RateConstantUnit, "drift" => "mol/(L·s)", "n" => "1", _ => "mol/L" }, pr[p["unit"]]);
                }
                if (!fit.Chosen) continue;
                // summary.json carries the chosen law only, with the numbers of its row here.
                chosenRows++;
                var c = summary[run.Id].GetProperty("chosenLaw");
                Assert.Equal(fit.Law, c.GetProperty("model").GetString());
                Assert.Equal(row[f["drift term"]], Bool(c.GetProperty("drift")));
                SameNumber(c.GetProperty("akaikeWeight"), row[f["Akaike weight"]]);
                SameNumber(c.GetProperty("halfLife"), row[f["half-life (s)"]]);
                Assert.Equal(row[f["lack of fit"]], Bool(c.GetProperty("lackOfFit")));
                var k = pars.Single(x => x[p["run"]] == run.Id && x[p["law"]] == fit.Law && x[p["parameter"]] == "k");
                SameNumber(c.GetProperty("rateConstant").GetProperty("value"), k[p["value"]]);
                Assert.Equal(c.GetProperty("rateConstant").GetProperty("unit").GetString(), k[p["unit"]]);
            }
            Assert.Equal(1, chosenRows);
        }
        Assert.Equal(fits.Count, fi);
        Assert.Equal(pars.Count, pi);
        Assert.True(fi >= 8 * 6, "every run has its candidate laws");
    }

    [Fact]
    public void Initial_rates_table_holds_every_estimate_and_marks_the_headline_of_summary_json()
    {
        var (header, rows) = Read(Path.Combine(_out.Path, RunTables.RatesFile));
        Assert.Equal(RunTables.RatesHeader, header);
        var c = Columns(header);
        var summary = Summary().GetProperty("runs").EnumerateArray().ToDictionary(r => r.GetProperty("id").GetString()!);
        var i = 0;
        foreach (var run in InMemory().Runs)
        {
            var headline = summary[run.Id].GetProperty("initialRate");
            var chosen = 0;
            foreach (var e in run.Rates.Estimates)
            {
                var row = rows[i++];
                Assert.Equal(run.Id, row[c["run"]]);
                Assert.Equal("mol/(L·s)", e.Unit); // the unit the columns' headers name
                Assert.Equal(e.Method, row[c["method"]]);
                Assert.Equal(e.Method.StartsWith("integrated", StringComparison.Ordinal) ? "law" : e.Method.StartsWith("polynomial", StringComparison.Ordinal) ? "polynomial" : "line", row[c["estimator"]]);
                SameNumber(e.Value, row[c["initial rate (mol/(L·s))"]]);
                SameNumber(e.StdError, row[c["std error (mol/(L·s))"]]);
                SameNumber(e.ModelStdError, row[c["model std error (mol/(L·s))"]]);
                SameNumber(Math.Abs(e.Value) * run.Converted.RelativeSystematicUncertainty, row[c["systematic std error (mol/(L·s))"]]);
                Assert.Equal(e.Dof.ToString(CultureInfo.InvariantCulture), row[c["dof"]]);
                Assert.Equal(e.PointsUsed.ToString(CultureInfo.InvariantCulture), row[c["points"]]);
                SameNumber(e.WindowStart, row[c["window start (s)"]]);
                SameNumber(e.WindowEnd, row[c["window end (s)"]]);
                if (row[c["chosen"]] != "true") continue;
                chosen++;
                // The chosen row is summary.json's headline, bit for bit.
                Assert.Equal(headline.GetProperty("method").GetString(), row[c["method"]]);
                SameNumber(headline.GetProperty("value"), row[c["initial rate (mol/(L·s))"]]);
                SameNumber(headline.GetProperty("stdError"), row[c["std error (mol/(L·s))"]]);
            }
            Assert.Equal(1, chosen);
        }
        Assert.Equal(rows.Count, i);
    }

    [Fact]
    public void Spikes_table_lists_every_excluded_sample_and_summary_json_counts_them()
    {
        var (header, rows) = Read(Path.Combine(_out.Path, RunTables.SpikesFile));
        Assert.Equal(RunTables.SpikesHeader, header);
        var summary = Summary().GetProperty("runs").EnumerateArray().ToDictionary(r => r.GetProperty("id").GetString()!);
        var i = 0;
        foreach (var run in InMemory().Runs)
        {
            Assert.Equal(run.Rates.Spikes.Count, summary[run.Id].GetProperty("spikeCount").GetInt32());
            if (run.Id == "R2") Assert.Equal(2, run.Rates.Spikes.Count);
            foreach (var sp in run.Rates.Spikes)
            {
                var row = rows[i++];
                Assert.Equal(run.Id, row[0]);
                SameNumber(sp.Time, row[1]);
                SameNumber(sp.Value, row[2]);
            }
        }
        Assert.Equal(rows.Count, i);
    }

    [Fact]
    public void Decimal_comma_tables_hold_the_same_cells_with_semicolons_and_decimal_commas()
    {
        var comma = CsvTable.NumberFormat(CsvStyle.DecimalComma);
        foreach (var file in (string[])[RunsCsv.FileName, PairRatiosCsv.FileName, .. RunTables.FileNames])
        {
            var (h1, r1) = Read(Path.Combine(_out.Path, file));
            var (h2, r2) = Read(Path.Combine(_outComma.Path, file), ';');
            Assert.Equal(h1, h2);
            Assert.Equal(r1.Count, r2.Count);
            for (var i = 0; i < r1.Count; i++)
                for (var j = 0; j < h1.Length; j++)
                {
                    var (a, b) = (r1[i][j], r2[i][j]);
                    if (double.TryParse(a, NumberStyles.Float, CultureInfo.InvariantCulture, out var x) && a.Any(char.IsDigit) && !a.Contains(','))
                        Assert.Equal(x, double.Parse(b, NumberStyles.Float, comma)); // the same number, bit for bit
                    else
                        Assert.Equal(a, b); // text is written as it is
                }
        }
        var (rh, rates) = Read(Path.Combine(_outComma.Path, RunTables.RatesFile), ';');
        Assert.Contains(",", rates[0][Array.IndexOf(rh, "initial rate (mol/(L·s))")]);
        Assert.DoesNotContain(".", rates[0][Array.IndexOf(rh, "initial rate (mol/(L·s))")]);
    }

    [Fact]
    public void Tables_streamed_as_runs_finish_equal_tables_written_from_the_whole_result()
    {
        using var whole = new RepoPaths.TempDir();
        AnalysedSample.Analyse(_series.Path, whole.Path, plots: false); // no sink: written from the result
        foreach (var file in RunTables.FileNames)
            Assert.Equal(File.ReadAllBytes(Path.Combine(whole.Path, file)), File.ReadAllBytes(Path.Combine(_out.Path, file)));
        Assert.Empty(Directory.EnumerateFiles(_out.Path, ".*.tmp"));
    }

    [Fact]
    public void Streamed_tables_leave_out_a_rejected_run_and_keep_plan_order()
    {
        using var series = RepoPaths.CopyOf(RepoPaths.Sample("violet-complex-acid"));
        using var outDir = new RepoPaths.TempDir();
        File.WriteAllText(Path.Combine(series.Path, "r3.csv"), "");
        Assert.Equal(ExitCodes.SomeRejected, Program.BuildRoot().Parse(["analyse", series.Path, "--out", outDir.Path, "--no-plots", "--workers", "2"]).Invoke());
        foreach (var file in RunTables.FileNames.Where(f => f != RunTables.SpikesFile)) // the demo has no spikes
        {
            var (_, rows) = Read(Path.Combine(outDir.Path, file));
            Assert.Equal(["R1", "R2", "R4", "R5", "R6", "R7", "R8"], rows.Select(r => r[0]).Distinct());
        }
    }
}
