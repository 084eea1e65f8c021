namespace TraceKin.Reports;

/// <summary>
/// The fixed prose of the HTML report: short method notes with their published sources, and the safety cautions.
/// Kept apart from the layout so the wording can be reviewed on its own (docs/methods.md holds the full formulas).
/// </summary>
internal static class ReportNotes
{
    /// <summary>(topic, note with source). Plain text; the report escapes it.</summary>
    public static IReadOnlyList<(string Topic, string Note)> Methods { get; } =
    [
        ("Signal to concentration",
            "Absorbance is converted with the Beer–Lambert law, A − A(blank) = ε·l·c (IUPAC Gold Book, \"Beer–Lambert law\", doi:10.1351/goldbook.B00626). " +
            "Other signal kinds state their conversion in the constants table above."),
        ("Initial rate",
            "v0 = (1/ν)·d[X]/dt at the moment of mixing, from a local quadratic or a straight line fitted by least squares over the early window " +
            "(method of initial rates; IUPAC Gold Book, \"rate of reaction\", doi:10.1351/goldbook.R05156). The window and method are listed per run. " +
            "Every rate and k here use that rate of reaction, with ν the followed species' signal.coefficient; when |ν| ≠ 1, k for the convention rate = −d[X]/dt is |ν|·k (summary.json, rateConvention)."),
        ("Orders and rate constant",
            "ln v0 = ln k + Σ n·ln[X]0 is fitted by linear least squares over all runs (IUPAC Gold Book, \"order of reaction\", doi:10.1351/goldbook.O04322). " +
            "95 % intervals use Student's t with the stated degrees of freedom (NIST/SEMATECH e-Handbook of Statistical Methods, 7.2.2)."),
        ("Temperature dependence",
            "Where runs differ in temperature, k(T) = A·exp(−Ea/RT) (IUPAC Gold Book, \"Arrhenius equation\", doi:10.1351/goldbook.A00446)."),
        ("Numbers in this report",
            "Each estimate is printed as value ± standard error, the standard error to two significant digits and the value to the same place " +
            "(JCGM 100:2008, 7.2.6). summary.json holds the unrounded values."),
    ];

    /// <summary>The method notes of a series analysed with <paramref name="config"/>: <see cref="Methods"/>, and after the
    /// initial rate a note on the integrated laws when rates.laws imposed them (only then, so other reports stay as they were).</summary>
    public static IReadOnlyList<(string Topic, string Note)> MethodsFor(Analysis.SeriesConfig? config)
    {
        if (config?.Rates.Laws is not { } laws) return Methods;
        var list = Methods.ToList();
        var at = list.FindIndex(m => m.Topic == "Initial rate") + 1;
        list.Insert(at, ("Integrated laws imposed",
            $"rates.laws in series.toml imposed the integrated rate law(s) fitted to every run: {string.Join(", ", laws)}. Only these were fitted " +
            "(with their drift variants as rates.drift says), so the law of each run was imposed, not chosen by AICc among every candidate law; " +
            "ΔAICc, Akaike weights and the law-averaged rate are over the listed laws only, and the law-choice part of the uncertainty " +
            "covers only the spread between them (none with one law and no drift variant). Lack of fit is still tested and flagged per run " +
            "(docs/methods.md, \"Imposed laws\")."));
        return list;
    }

    /// <summary>Safety cautions shown in every report and in README.md.</summary>
    public static IReadOnlyList<(string Topic, string Note)> Cautions { get; } =
    [
        ("Pressure in closed vessels",
            "Reactions that evolve gas build up pressure in a closed vessel. Size the vessel, its relief and its monitoring for the largest gas volume the " +
            "reaction can release, not for the volume seen in a short run."),
        ("Extrapolation",
            "Rates, orders and Arrhenius parameters hold only over the concentrations and temperatures measured. Do not extrapolate them beyond that " +
            "range to decide on scale-up or thermal safety; such decisions need dedicated calorimetric and hazard studies."),
        ("Reagents",
            "Treat every reagent, solvent and product according to its safety data sheet."),
        ("Responsibility",
            "TraceKin computes numbers from the data it is given. Local codes, the safety data sheets and licensed professional practice take precedence " +
            "over anything in this report."),
    ];
}
