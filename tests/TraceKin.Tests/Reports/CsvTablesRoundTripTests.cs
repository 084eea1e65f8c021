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

    [Fact]
    public void Law_fits_and_their_parameters_hold_every_fit_of_summary_json()
    {
        var (fh, fits) = Read(Path.Combine(_out.Path, RunTables.FitsFile));
        var (ph, pars) = Read(Path.Combine(_out.Path, RunTables.ParametersFile));
        Assert.Equal(RunTables.FitsHeader, fh);
        Assert.Equal(RunTables.ParametersHeader, ph);
        var f = Columns(fh);
        var p = Columns(ph);
        int fi = 0, pi = 0;
        foreach (var run in Summary().GetProperty("runs").EnumerateArray())
        {
            var id = run.GetProperty("id").GetString();
            foreach (var fit in run.GetProperty("fits").EnumerateArray())
            {
                var row = fits[fi++];
                var law = fit.GetProperty("model").GetString();
                Assert.Equal(id, row[f["run"]]);
                Assert.Equal(law, row[f["law"]]);
                Assert.Equal(Bool(fit.GetProperty("drift")), row[f["drift term"]]);
                Assert.Equal(Bool(fit.GetProperty("chosen")), row[f["chosen"]]);
                Assert.Equal(fit.GetProperty("exit").GetString(), row[f["exit"]]);
                Assert.Equal(Bool(fit.GetProperty("converged")), row[f["converged"]]);
                Assert.Equal(fit.GetProperty("points").GetInt32().ToString(CultureInfo.InvariantCulture), row[f["points"]]);
                Assert.Equal(fit.GetProperty("dof").GetInt32().ToString(CultureInfo.InvariantCulture), row[f["dof"]]);
                SameNumber(fit.GetProperty("rSquared"), row[f["r squared"]]);
                SameNumber(fit.GetProperty("aicc"), row[f["AICc"]]);
                SameNumber(fit.GetProperty("bic"), row[f["BIC"]]);
                SameNumber(fit.GetProperty("deltaAicc"), row[f["delta AICc"]]);
                SameNumber(fit.GetProperty("akaikeWeight"), row[f["Akaike weight"]]);
                SameNumber(fit.GetProperty("halfLife"), row[f["half-life (s)"]]);
                SameNumber(fit.GetProperty("halfLifeStdError"), row[f["half-life std error (s)"]]);
                SameNumber(fit.GetProperty("runsTestP"), row[f["runs test p"]]);
                Assert.Equal(Bool(fit.GetProperty("lackOfFit")), row[f["lack of fit"]]);
                Assert.Equal(fit.GetProperty("excludedBecause").GetString() ?? "", row[f["excluded because"]]);
                var k = fit.GetProperty("rateConstant");
                foreach (var par in fit.GetProperty("parameters").EnumerateArray())
                {
                    var pr = pars[pi++];
                    var name = par.GetProperty("name").GetString();
                    Assert.Equal((id, law, name), (pr[p["run"]], pr[p["law"]], pr[p["parameter"]]));
                    SameNumber(par.GetProperty("value"), pr[p["value"]]);
                    SameNumber(par.GetProperty("stdError"), pr[p["std error"]]);
                    Assert.Equal(Bool(par.GetProperty("varied")), pr[p["varied"]]);
                    // k in the unit summary.json gives the fit's rate constant; the trace is in mol/L (docs/formats.md).
                    Assert.Equal(name switch { "k" => k.GetProperty("unit").GetString(), "drift" => "mol/(L·s)", "n" => "1", _ => "mol/L" }, pr[p["unit"]]);
                    if (name == "k" && fit.GetProperty("converged").GetBoolean()) SameNumber(k.GetProperty("value"), pr[p["value"]]);
                }
            }
        }
        Assert.Equal(fits.Count, fi);
        Assert.Equal(pars.Count, pi);
        Assert.True(fi >= 8 * 6, "every run has its candidate laws");
    }

    [Fact]
    public void Initial_rates_table_holds_every_estimate_and_marks_the_headline()
    {
        var (header, rows) = Read(Path.Combine(_out.Path, RunTables.RatesFile));
        Assert.Equal(RunTables.RatesHeader, header);
        var c = Columns(header);
        var i = 0;
        foreach (var run in Summary().GetProperty("runs").EnumerateArray())
        {
            var headline = run.GetProperty("initialRate");
            var chosen = 0;
            foreach (var e in run.GetProperty("initialRateEstimates").EnumerateArray())
            {
                var row = rows[i++];
                Assert.Equal(run.GetProperty("id").GetString(), row[c["run"]]);
                Assert.Equal("mol/(L·s)", e.GetProperty("unit").GetString()); // the unit the columns' headers name
                var method = e.GetProperty("method").GetString()!;
                Assert.Equal(method, row[c["method"]]);
                Assert.Equal(method.StartsWith("integrated", StringComparison.Ordinal) ? "law" : method.StartsWith("polynomial", StringComparison.Ordinal) ? "polynomial" : "line", row[c["estimator"]]);
                SameNumber(e.GetProperty("value"), row[c["initial rate (mol/(L·s))"]]);
                SameNumber(e.GetProperty("stdError"), row[c["std error (mol/(L·s))"]]);
                SameNumber(e.GetProperty("modelStdError"), row[c["model std error (mol/(L·s))"]]);
                SameNumber(e.GetProperty("systematicStdError"), row[c["systematic std error (mol/(L·s))"]]);
                Assert.Equal(e.GetProperty("dof").GetInt32().ToString(CultureInfo.InvariantCulture), row[c["dof"]]);
                Assert.Equal(e.GetProperty("points").GetInt32().ToString(CultureInfo.InvariantCulture), row[c["points"]]);
                SameNumber(e.GetProperty("windowStart"), row[c["window start (s)"]]);
                SameNumber(e.GetProperty("windowEnd"), row[c["window end (s)"]]);
                var isHeadline = method == headline.GetProperty("method").GetString() && e.GetProperty("value").GetDouble() == headline.GetProperty("value").GetDouble();
                Assert.Equal(isHeadline ? "true" : "false", row[c["chosen"]]);
                if (isHeadline) chosen++;
            }
            Assert.Equal(1, chosen);
        }
        Assert.Equal(rows.Count, i);
    }

    [Fact]
    public void Decimal_comma_tables_hold_the_same_cells_with_semicolons_and_decimal_commas()
    {
        var comma = CsvTable.NumberFormat(CsvStyle.DecimalComma);
        foreach (var file in (string[])[RunsCsv.FileName, .. RunTables.FileNames])
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
        foreach (var file in RunTables.FileNames)
        {
            var (_, rows) = Read(Path.Combine(outDir.Path, file));
            Assert.Equal(["R1", "R2", "R4", "R5", "R6", "R7", "R8"], rows.Select(r => r[0]).Distinct());
        }
    }
}
