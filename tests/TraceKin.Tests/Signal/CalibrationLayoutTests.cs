using System.Globalization;
using TraceKin.Analysis;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Signal;

/// <summary>
/// Calibration tables as labs write them: one concentration column with a signal column per standard species, or one
/// file per species; units from the headers, checked against each other and the channel.
/// Invented standards, exact straight lines: X alone reads 0.05 + 0.8·c mS/cm, Y alone 0.05 + 0.3·c mS/cm
/// (c in mmol/L). The run X → Y starts at [X]0 = 3 mmol/L, [Y]0 = 0, so at extent ξ κ = 0.05 + 0.8·(3 − ξ) + 0.3·ξ and,
/// by hand, ξ = (2.45 − κ)/0.5 and [X] = 3 − ξ mmol/L (a linear, additive response, Kohlrausch, from memory).
/// </summary>
public sealed class CalibrationLayoutTests
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    private static readonly double[] Levels = [0, 1, 2, 3, 4];
    private static readonly double[] Kappa = [2.45, 2.1, 1.7, 1.3, 1.0]; // mS/cm

    private const string Toml = "[signal]\nkind = \"calibrated\"\nchannel = \"kappa (mS/cm)\"\nspecies = \"X\"\ncoefficient = -1\n" +
                                "[signal.calibration]\nfile = \"standards.csv\"\n[[signal.calibration.other]]\nspecies = \"Y\"\ncoefficient = 1\n";

    private static string N(double v) => v.ToString("R", Inv);
    private static double SignalX(double c) => 0.05 + 0.8 * c;
    private static double SignalY(double c) => 0.05 + 0.3 * c;

    private static SeriesResult Analyse(string dir, string toml, params (string Name, string Text)[] files)
    {
        File.WriteAllText(Path.Combine(dir, "r1.csv"), "time (s),kappa (mS/cm)\n" + string.Join("\n", Kappa.Select((k, i) => $"{10 * i},{N(k)}")) + "\n");
        File.WriteAllText(Path.Combine(dir, "plan.csv"), "run,file,temperature (°C),[X]0 (mmol/L)\nR1,r1.csv,25,3\n");
        File.WriteAllText(Path.Combine(dir, "series.toml"), toml);
        foreach (var (name, text) in files) File.WriteAllText(Path.Combine(dir, name), text);
        return SeriesRunner.Analyse(dir, new AnalysisOptions { Workers = 1, Retention = TraceRetention.Full });
    }

    private static void AssertHandComputed(SeriesResult result)
    {
        Assert.True(result.Rejected.Count == 0, string.Join("; ", result.Rejected.Select(p => p.Message)));
        var conc = result.Runs.Single().Converted.Concentration.Values;
        for (var i = 0; i < Kappa.Length; i++)
            Assert.Equal((3 - (2.45 - Kappa[i]) / 0.5) * 1e-3, conc[i], 1e-12);
    }

    [Fact]
    public void One_concentration_column_with_a_signal_column_per_species_is_read_as_each_species_alone()
    {
        using var dir = new RepoPaths.TempDir();
        var csv = "concentration (mmol/L),X (mS/cm),Y (mS/cm)\n" + string.Join("\n", Levels.Select(c => $"{c},{N(SignalX(c))},{N(SignalY(c))}")) + "\n";
        AssertHandComputed(Analyse(dir.Path, Toml, ("standards.csv", csv)));
    }

    [Fact]
    public void Signal_columns_in_different_units_of_one_quantity_are_converted_to_the_first_one()
    {
        using var dir = new RepoPaths.TempDir();
        // Y's column in S/m: 1 mS/cm = 0.1 S/m (SI prefixes, BIPM SI Brochure, 9th ed.).
        var csv = "concentration (µmol/L),X (mS/cm),Y (S/m)\n" + string.Join("\n", Levels.Select(c => $"{c * 1000},{N(SignalX(c))},{N(SignalY(c) * 0.1)}")) + "\n";
        AssertHandComputed(Analyse(dir.Path, Toml, ("standards.csv", csv)));
    }

    [Fact]
    public void One_file_per_species_is_joined_into_one_calibration()
    {
        using var dir = new RepoPaths.TempDir();
        var toml = Toml.Replace("coefficient = 1\n", "coefficient = 1\nfile = \"std-y.csv\"\n");
        var x = "signal (mS/cm),concentration (mmol/L)\n" + string.Join("\n", Levels.Select(c => $"{N(SignalX(c))},{c}")) + "\n";
        var y = "signal (mS/cm),[Y] (mmol/L)\n" + string.Join("\n", Levels.Select(c => $"{N(SignalY(c))},{c}")) + "\n";
        AssertHandComputed(Analyse(dir.Path, toml, ("standards.csv", x), ("std-y.csv", y)));
    }

    [Fact]
    public void A_signal_column_for_a_species_the_calibration_does_not_name_is_located_and_lists_the_names()
    {
        using var dir = new RepoPaths.TempDir();
        var csv = "concentration (mmol/L),X (mS/cm),Z (mS/cm)\n0,0.05,0.05\n1,0.85,0.35\n2,1.65,0.65\n3,2.45,0.95\n";
        var p = Analyse(dir.Path, Toml, ("standards.csv", csv)).Rejected.Single();
        Assert.Equal(("standards.csv", 1, 34), (p.File, p.Line, p.Column));
        Assert.Contains("X, Y", p.Expected);
    }

    [Fact]
    public void Signal_columns_of_different_quantities_are_an_error_naming_both_units()
    {
        using var dir = new RepoPaths.TempDir();
        var csv = "concentration (mmol/L),X (mS/cm),Y (kPa)\n0,0.05,0.05\n1,0.85,0.35\n2,1.65,0.65\n3,2.45,0.95\n";
        var p = Analyse(dir.Path, Toml, ("standards.csv", csv)).Rejected.Single();
        Assert.Equal(("standards.csv", 1, 34), (p.File, p.Line, p.Column));
        Assert.Contains("kPa", p.Found);
        Assert.Contains("mS/cm", p.Expected);
    }

    [Fact]
    public void Per_species_files_in_units_of_different_quantities_are_an_error_naming_both_units()
    {
        using var dir = new RepoPaths.TempDir();
        var toml = Toml.Replace("coefficient = 1\n", "coefficient = 1\nfile = \"std-y.csv\"\n");
        var x = "signal (mS/cm),[X] (mmol/L)\n0.05,0\n0.85,1\n1.65,2\n2.45,3\n";
        var y = "signal (AU),[Y] (mmol/L)\n0.05,0\n0.35,1\n0.65,2\n0.95,3\n";
        var p = Analyse(dir.Path, toml, ("standards.csv", x), ("std-y.csv", y)).Rejected.Single();
        Assert.Equal("std-y.csv", p.File);
        Assert.Contains("AU", p.Found);
        Assert.Contains("mS/cm", p.Expected);
    }

    [Fact]
    public void A_missing_file_of_another_species_is_located_at_its_key()
    {
        using var dir = new RepoPaths.TempDir();
        var toml = Toml.Replace("coefficient = 1\n", "coefficient = 1\nfile = \"std-y.csv\"\n");
        var x = "signal (mS/cm),[X] (mmol/L)\n0.05,0\n0.85,1\n1.65,2\n2.45,3\n";
        var p = Analyse(dir.Path, toml, ("standards.csv", x)).Rejected.Single();
        Assert.Equal(("series.toml", "signal.calibration.other[0].file"), (p.File, p.Key));
        Assert.Equal(11, p.Line);
    }

    [Fact]
    public void A_file_for_one_other_species_but_not_the_followed_one_is_an_error_at_the_key()
    {
        var toml = "[signal]\nkind = \"calibrated\"\nspecies = \"X\"\n[signal.calibration]\nsignal = [0.05, 0.85, 1.65, 2.45]\nconcentration = [0, 1, 2, 3]\n" +
                   "[[signal.calibration.other]]\nspecies = \"Y\"\ncoefficient = 1\nfile = \"std-y.csv\"\n";
        var ex = Assert.Throws<TraceKin.Traces.InputException>(() => TraceKin.Analysis.SeriesConfig.FromText(toml, "series.toml"));
        Assert.Equal("signal.calibration.file", ex.Problem.Key);
    }
}
