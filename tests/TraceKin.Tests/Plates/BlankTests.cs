using System.Globalization;
using System.Text;
using TraceKin.Analysis;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Tests.Plates;

/// <summary>
/// Blank wells subtracted point by point. Every well of the invented plate shares a background that settles upward
/// (0.05 + 0.03·(1 − exp(−t/60 s)) AU, rising at 5e-4 AU/s at t = 0); sample wells add a first-order loss of S,
/// ε·l·c0·exp(−k·t), whose initial rate is k·c0 (closed-form integrated law, common practice, no source). Without the
/// blank, the background's rise is read as a slower loss of S.
/// </summary>
public class BlankTests
{
    private const double K = 0.01;

    private static string Export()
    {
        var r = new Random(11);
        var sb = new StringBuilder("time (s),A1,A2,A3,H1,H2,H3\n");
        for (var i = 0; i < 120; i++)
        {
            var t = 2.0 * i;
            var background = 0.05 + 0.03 * (1 - Math.Exp(-t / 60));
            sb.Append(t.ToString(CultureInfo.InvariantCulture));
            foreach (var c0 in new[] { 0.0004, 0.0006, 0.0008 })
                sb.Append(',').Append((background + 1000 * c0 * Math.Exp(-K * t) + 0.0005 * PlateFolder.Gaussian(r)).ToString("F5", CultureInfo.InvariantCulture));
            for (var b = 0; b < 3; b++)
                sb.Append(',').Append((background + 0.0005 * PlateFolder.Gaussian(r)).ToString("F5", CultureInfo.InvariantCulture));
            sb.Append('\n');
        }
        return sb.ToString();
    }

    private const string Plan = """
        run,file,channel,role,group,subtract,[S]0 (mmol/L)
        s1,plate.csv,A1,sample,,buffer,0.4
        s2,plate.csv,A2,sample,,buffer,0.6
        s3,plate.csv,A3,sample,,H3,0.8
        b1,plate.csv,H1,blank,buffer,,0
        b2,plate.csv,H2,blank,buffer,,0
        b3,plate.csv,H3,blank,,,0
        """;

    private static SeriesResult Analyse(string plan, string export)
    {
        using var folder = new PlateFolder(PlateFolder.Toml.Replace("blank = 0.04", "blank = 0"));
        folder.Write("plate.csv", export);
        folder.Write("plan.csv", plan);
        return SeriesRunner.Analyse(folder.Path, new AnalysisOptions { Workers = 2 });
    }

    [Fact]
    public void Subtracting_a_blank_group_or_a_blank_run_removes_the_shared_drift()
    {
        var result = Analyse(Plan, Export());
        var plain = Analyse(Plan.Replace(",buffer,0.", ",,0.").Replace(",H3,0.8", ",,0.8"), Export());

        Assert.True(result.Rejected.Count == 0, string.Join("\n", result.Rejected.Select(p => p.Message)));
        foreach (var (id, c0) in new[] { ("s1", 0.0004), ("s2", 0.0006), ("s3", 0.0008) })
        {
            var truth = K * c0;
            var run = result.Runs.Single(r => r.Id == id);
            Assert.InRange(run.Rates.Headline.Value, truth * 0.97, truth * 1.03);
            Assert.Contains(run.Converted.ConstantsUsed, c => c.Key == "blank subtracted");
            // without the blank the settling background pulls each rate off by more than the 3 % allowed above
            var plainRate = plain.Runs.Single(r => r.Id == id).Rates.Headline.Value;
            Assert.True(Math.Abs(plainRate - truth) > 0.03 * truth, $"{id}: {plainRate} against {truth}");
        }
        // blank runs are shown but are no point of the series fit
        Assert.Equal(6, result.Runs.Count);
    }

    [Fact]
    public void A_blank_that_is_itself_rejected_rejects_its_runs_at_their_subtract_cell_and_the_others_go_on()
    {
        var result = Analyse(Plan.Replace("b3,plate.csv,H3", "b3,plate.csv,H9").Replace(",H3,0.8", ",b3,0.8"), Export());

        // b3's own channel is missing (plan line 7); s3 subtracts it (line 4, subtract cell at column 25)
        Assert.True(result.Rejected.Count == 2, string.Join("\n", result.Rejected.Select(p => p.Message)));
        var s3 = result.Rejected.Single(p => p.Line == 4);
        Assert.Equal(("plan.csv", 25), (s3.File, s3.Column));
        Assert.Contains("blank run \"b3\", which is itself rejected", s3.Found);
        Assert.Contains(result.Rejected, p => p.Line == 7);
        Assert.Equal(4, result.Runs.Count);
    }

    [Fact]
    public void A_subtract_cell_naming_nothing_is_located()
    {
        var ex = Assert.Throws<InputException>(() => TraceKin.Setup.Plan.FromText(Plan.Replace(",H3,0.8", ",H4,0.8"), "plan.csv"));
        Assert.Equal((4, 25), (ex.Problem.Line, ex.Problem.Column));
        Assert.Contains("groups: buffer", ex.Problem.Expected);
    }
}
