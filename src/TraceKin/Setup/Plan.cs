using System.Globalization;
using System.Text.RegularExpressions;
using TraceKin.Traces;

namespace TraceKin.Setup;

/// <summary>One run of the plan. Concentrations in mol/L keyed by species name ("A" for a column "[A]0 (mmol/L)").</summary>
public sealed record PlanRow(
    string Run,
    string File,
    double? TemperatureK,
    IReadOnlyDictionary<string, double> InitialConcentrations,
    IReadOnlyDictionary<string, string> Extra,
    int Line)
{
    /// <summary>1-based column number where the row's file cell starts (for messages about the file it names).</summary>
    public int FileColumn { get; init; } = 1;

    /// <summary>1-based line number where the row's file cell starts (0: the row's <see cref="Line"/>; they differ
    /// only when a quoted cell before it spans lines).</summary>
    public int FileLine { get; init; }

    /// <summary>
    /// The run's own conversion parameters from plan.csv columns (see <see cref="Plan.ConditionNames"/>), keyed by the
    /// series.toml key they override, in internal units (Pa, AU, cm, L, K).
    /// </summary>
    public IReadOnlyDictionary<string, PlanCondition> Conditions { get; init; } = new Dictionary<string, PlanCondition>();

    /// <summary>Initial amounts given as partial pressures: species → pressure, Pa (their concentrations are p/(R·T)).</summary>
    public IReadOnlyDictionary<string, double> InitialPressures { get; init; } = new Dictionary<string, double>();

    /// <summary>1-based column number of each parameter column's cell on this row (filled or not), to locate an empty one.</summary>
    public IReadOnlyDictionary<string, int> ConditionCells { get; init; } = new Dictionary<string, int>();

    /// <summary>The export channel this run reads (plan column `channel`, e.g. a well "B7"); null: series.toml's signal.channel.</summary>
    public string? Channel { get; init; }

    /// <summary>"sample" (default) or "blank" (plan column `role`): a blank run is analysed and shown but kept out of the series fits.</summary>
    public string Role { get; init; } = "sample";

    /// <summary>The group a blank run belongs to (plan column `group`), named by other runs' `subtract` cells.</summary>
    public string? Group { get; init; }

    /// <summary>What this run subtracts point by point before conversion (plan column `subtract`): a run id, or a group of blank runs whose mean is taken.</summary>
    public string? Subtract { get; init; }

    /// <summary>The run ids <see cref="Subtract"/> resolves to (one run, or every blank run of the group), in plan order.</summary>
    public IReadOnlyList<string> BlankRuns { get; init; } = [];

    /// <summary>1-based line and column of the row's subtract cell (0 when the plan has no subtract column).</summary>
    public (int Line, int Column) SubtractCell { get; init; }

    /// <summary>1-based line and column of the row's channel cell (0 when the plan has no channel column).</summary>
    public (int Line, int Column) ChannelCell { get; init; }

    /// <summary>1-based line number of each parameter column's cell on this row (differs from <see cref="Line"/> only
    /// after a quoted cell that spans lines).</summary>
    public IReadOnlyDictionary<string, int> ConditionLines { get; init; } = new Dictionary<string, int>();
}

/// <summary>One run's value of a conversion parameter read from plan.csv, in internal units, with its cell.</summary>
public sealed record PlanCondition(double Value, string Header, int Line, int Column)
{
    /// <summary>Where the value was written when not in plan.csv (a plate map's cell), as the report prints it.</summary>
    public string? Origin { get; init; }

    /// <summary>Where the value came from, as the report prints it.</summary>
    public string Source => Origin ?? $"plan.csv line {Line}, column \"{Header}\"";
}

/// <summary>A column of plan.csv as read: its header text and 1-based column number.</summary>
public sealed record PlanColumn(string Header, int Column);

/// <summary>
/// plan.csv: the series' run table. Columns `run`, `file`, `temperature (unit)` and one `[X]0 (unit)` per species;
/// other columns are kept as text. Comma or semicolon delimited; decimal point, or decimal comma with semicolons.
/// Read with <see cref="SetupTable"/> (CsvHelper): quoted cells, a byte order mark, # comments.
/// </summary>
public sealed partial record Plan(string File, IReadOnlyList<PlanRow> Rows, IReadOnlyList<string> Species)
{
    /// <summary>
    /// Conversion parameters a plan.csv column may give per run, overriding the series.toml key of the same name
    /// (gas_temperature overrides signal.temperature), and the quantity of the unit its header must carry.
    /// </summary>
    public static IReadOnlyDictionary<string, Quantity> ConditionNames { get; } = new Dictionary<string, Quantity>(StringComparer.Ordinal)
    {
        ["barometric_pressure"] = Quantity.Pressure,
        ["blank"] = Quantity.Absorbance,
        ["path_length"] = Quantity.Other,
        ["solution_volume"] = Quantity.GasVolume,
        ["zero_offset"] = Quantity.GasVolume,
        ["gas_temperature"] = Quantity.Temperature,
    };

    /// <summary>1-based line number of the header.</summary>
    public int HeaderLine { get; init; } = 1;

    /// <summary>For a plan built in memory (from a plate map): moves a problem located in the plan's text to where its
    /// value was written. Null for plan.csv itself.</summary>
    public Func<Problem, Problem>? Origin { get; init; }

    /// <summary>A problem located at a cell of this plan (file plan.csv or <see cref="File"/>), moved to where the
    /// cell's value was written when the plan was built in memory; any other problem unchanged.</summary>
    public Problem Locate(Problem p) => Origin is { } origin && (p.File == File || p.File == "plan.csv") ? origin(p) : p;
    /// <summary>The [X]0 column of each species.</summary>
    public IReadOnlyDictionary<string, PlanColumn> SpeciesColumns { get; init; } = new Dictionary<string, PlanColumn>();
    /// <summary>The conversion-parameter columns present, keyed as <see cref="ConditionNames"/>.</summary>
    public IReadOnlyDictionary<string, PlanColumn> ConditionColumns { get; init; } = new Dictionary<string, PlanColumn>();

    [GeneratedRegex(@"^\[(?<sp>[^\]]+)\]\s*0\s*(?:[\(\[](?<unit>[^\)\]]*)[\)\]])?$")]
    private static partial Regex SpeciesHeader();

    [GeneratedRegex(@"^(?<name>[^\(\[]+?)\s*(?:[\(\[](?<unit>[^\)\]]*)[\)\]])?$")]
    private static partial Regex UnitHeader();

    private static readonly IReadOnlyDictionary<string, string> NoText = new Dictionary<string, string>();
    private static readonly IReadOnlyDictionary<string, double> NoNumbers = new Dictionary<string, double>();
    private static readonly IReadOnlyDictionary<string, int> NoIndices = new Dictionary<string, int>();
    private static readonly IReadOnlyDictionary<string, PlanCondition> NoConditions = new Dictionary<string, PlanCondition>();

    public static Plan FromFile(string path) =>
        FromText(System.IO.File.ReadAllText(path), System.IO.Path.GetFileName(path));

    public static Plan FromText(string text, string file)
    {
        var table = SetupTable.FromText(text, file)
            ?? throw Fail.At(file, 1, 1, "an empty file", "a header line: run,file,temperature (°C),[A]0 (mmol/L)", "see docs/formats.md");
        var delimiter = table.Delimiter;
        var head = table.Header;
        var header = head.Cells.Select(c => c.Text).ToArray();
        var headerText = string.Join(delimiter, header);

        int runCol = -1, fileCol = -1, tempCol = -1, channelCol = -1, roleCol = -1, groupCol = -1, subtractCol = -1;
        UnitInfo? tempUnit = null;
        var species = new List<(string Name, int Col, UnitInfo Unit)>();
        var conditions = new List<(string Name, string Header, int Col, UnitInfo Unit)>();
        var extra = new List<(string Name, int Col)>();
        for (var c = 0; c < header.Length; c++)
        {
            var h = header[c].Trim();
            var (hl, at) = (head[c].Line, head[c].Column);
            var sm = SpeciesHeader().Match(h);
            if (sm.Success)
            {
                var unitText = sm.Groups["unit"].Success ? sm.Groups["unit"].Value : "";
                if (unitText.Length == 0)
                    throw Fail.At(file, hl, at, Fail.Quote(h), "a concentration or pressure unit in the header, e.g. \"[A]0 (mmol/L)\" or \"[A]0 (kPa)\"");
                // A gas-phase series may be planned in partial pressures: [X]0 = p/(R·T) with the run's temperature.
                var su = Units.Find(unitText);
                if (su is not { Quantity: Quantity.Concentration or Quantity.Pressure })
                    throw Fail.At(file, hl, at, $"unit {Fail.Quote(unitText)}",
                        $"a concentration unit ({string.Join(", ", Units.Examples(Quantity.Concentration))}) or a partial pressure unit ({string.Join(", ", Units.Examples(Quantity.Pressure))})",
                        "e.g. \"[A]0 (mmol/L)\", or \"[A]0 (kPa)\" for a gas converted with the run's temperature");
                species.Add((sm.Groups["sp"].Value.Trim(), c, su));
                continue;
            }
            var um = UnitHeader().Match(h);
            var name = um.Success ? um.Groups["name"].Value.Trim().ToLowerInvariant() : h.ToLowerInvariant();
            var conditionName = name.Replace(' ', '_');
            if (ConditionNames.TryGetValue(conditionName, out var cq))
            {
                var u = um.Groups["unit"].Success ? um.Groups["unit"].Value.Trim() : "";
                if (conditions.Any(x => x.Name == conditionName))
                    throw Fail.At(file, hl, at, Fail.Quote(h), $"one column \"{conditionName}\" only");
                if (u.Length == 0 && cq != Quantity.Absorbance)
                    throw Fail.At(file, hl, at, Fail.Quote(h), $"a {Units.Describe(cq)} unit in the header, e.g. \"{conditionName} ({Units.Examples(cq).First()})\"");
                conditions.Add((conditionName, h, c, Units.Require(u, cq, file, hl, at)));
                continue;
            }
            switch (name)
            {
                case "run": runCol = c; break;
                case "file": fileCol = c; break;
                case "channel": channelCol = c; break;
                case "role": roleCol = c; break;
                case "group": groupCol = c; break;
                case "subtract": subtractCol = c; break;
                case "temperature" or "t" or "temp":
                    tempCol = c;
                    var u = um.Groups["unit"].Success ? um.Groups["unit"].Value : "";
                    if (u.Length == 0)
                        throw Fail.At(file, hl, at, Fail.Quote(h), "a temperature unit in the header, e.g. \"temperature (°C)\" or \"temperature (K)\"");
                    tempUnit = Units.Require(u, Quantity.Temperature, file, hl, at);
                    break;
                default: extra.Add((h, c)); break;
            }
        }
        if (runCol < 0) throw Fail.At(file, head.Line, 1, Fail.Quote(headerText), "a column named \"run\"");
        if (fileCol < 0) throw Fail.At(file, head.Line, 1, Fail.Quote(headerText), "a column named \"file\"");

        // A semicolon-delimited plan may use decimal commas; a comma-delimited one cannot.
        var culture = delimiter == ';' && LooksDecimalComma(table.Rows) ? CultureInfo.GetCultureInfo("de-DE") : CultureInfo.InvariantCulture;
        var rows = new List<PlanRow>();
        var sameConc = new Dictionary<string, Dictionary<string, double>>(StringComparer.Ordinal);
        var seenRuns = new Dictionary<string, int>(StringComparer.Ordinal);
        var seenChannels = new Dictionary<(string File, string Channel), int>();
        foreach (var rec in table.Rows)
        {
            if (rec.Count != header.Length)
            {
                var (ml, mc) = rec.At(Math.Min(rec.Count, header.Length));
                throw Fail.At(file, ml, mc, $"{rec.Count} cells", $"{header.Length} cells, as in the header", "check for a missing or extra delimiter");
            }
            var run = rec[runCol].Trimmed;
            if (run.Length == 0) throw Fail.At(file, rec[runCol].Line, rec[runCol].Column, "an empty run id", "a run id");
            if (seenRuns.TryGetValue(run, out var firstLine))
                throw Fail.At(file, rec[runCol].Line, rec[runCol].Column, $"run id {Fail.Quote(run)} again (first on line {firstLine})", "a unique run id per row");
            seenRuns[run] = rec.Line;
            var fileName = rec[fileCol].Trimmed;
            if (fileName.Length == 0) throw Fail.At(file, rec[fileCol].Line, rec[fileCol].Column, "an empty file name", "the export's file name");
            string? channel = null;
            if (channelCol >= 0 && rec[channelCol].Trimmed.Length > 0)
            {
                var cell = rec[channelCol];
                channel = cell.Trimmed;
                // Two runs reading the same channel of the same file are a typing slip (A1 and A01 are one well).
                var key = (fileName, WellName.Normalise(channel) ?? channel.ToUpperInvariant());
                if (seenChannels.TryGetValue(key, out var firstChannelLine))
                    throw Fail.At(file, cell.Line, cell.Column, $"channel {Fail.Quote(channel)} of {Fail.Quote(fileName)} again (first on line {firstChannelLine})",
                        "each channel of a file read by one run only", "check the channel column for a repeated well");
                seenChannels[key] = cell.Line;
            }
            var role = "sample";
            if (roleCol >= 0 && rec[roleCol].Trimmed.Length > 0)
            {
                role = rec[roleCol].Trimmed.ToLowerInvariant();
                if (role is not ("sample" or "blank"))
                    throw Fail.At(file, rec[roleCol].Line, rec[roleCol].Column, Fail.Quote(rec[roleCol].Trimmed), "a role: sample or blank (or empty for sample)");
            }
            double? temp = null;
            if (tempCol >= 0 && rec[tempCol].Trimmed.Length > 0)
            {
                var cell = rec[tempCol];
                var t = tempUnit!.ToInternal(Number(cell, culture, file));
                if (!(t > 0 && t < 1000))
                    throw Fail.At(file, cell.Line, cell.Column, Fail.Quote(cell.Text), "a temperature between 0 K and 1000 K");
                temp = t;
            }
            var cond = new Dictionary<string, PlanCondition>(StringComparer.Ordinal);
            var condCells = new Dictionary<string, int>(StringComparer.Ordinal);
            var condLines = new Dictionary<string, int>(StringComparer.Ordinal);
            foreach (var (cn, ch, col, unit) in conditions)
            {
                var cell = rec[col];
                condCells[cn] = cell.Column;
                condLines[cn] = cell.Line;
                if (cell.Trimmed.Length == 0) continue;
                var v = unit.ToInternal(Number(cell, culture, file));
                var ok = cn switch
                {
                    "blank" => true,
                    "zero_offset" => v >= 0,
                    "gas_temperature" => v > 0 && v < 1000,
                    _ => v > 0,
                };
                if (!ok)
                    throw Fail.At(file, cell.Line, cell.Column, Fail.Quote(cell.Trimmed), cn switch
                    {
                        "zero_offset" => "a volume ≥ 0",
                        "gas_temperature" => "a temperature between 0 K and 1000 K",
                        _ => $"a positive {Units.Describe(ConditionNames[cn])}",
                    });
                cond[cn] = new PlanCondition(v, ch, cell.Line, cell.Column);
            }
            var conc = new Dictionary<string, double>(StringComparer.Ordinal);
            var pressures = new Dictionary<string, double>(StringComparer.Ordinal);
            foreach (var (sp, col, unit) in species)
            {
                var cell = rec[col];
                if (cell.Trimmed.Length == 0) continue;
                var v = unit.ToInternal(Number(cell, culture, file));
                if (v < 0) throw Fail.At(file, cell.Line, cell.Column, Fail.Quote(cell.Text), unit.Quantity == Quantity.Pressure ? "a partial pressure ≥ 0" : "a concentration ≥ 0");
                if (unit.Quantity == Quantity.Pressure)
                {
                    // Perfect-gas equation c = n/V = p/(R·T) (IUPAC Green Book, 3rd ed., §2.11, from memory); /1000 for mol/L.
                    var tGas = cond.TryGetValue("gas_temperature", out var gt) ? gt.Value : temp
                        ?? throw Fail.At(file, cell.Line, cell.Column, Fail.Quote(cell.Trimmed) + " (a partial pressure)",
                            "a temperature for this run to turn the pressure into a concentration", "fill the row's \"temperature (°C)\" or \"gas_temperature (°C)\" cell");
                    pressures[sp] = v;
                    v = v / (PhysicalConstants.GasConstant * tGas) / 1000;
                }
                conc[sp] = v;
            }
            // Rows planned at the same concentrations (replicates, a plate's conditions) share one table of them.
            var concKey = string.Join("\u0001", conc.Select(kv => kv.Key.Length.ToString(CultureInfo.InvariantCulture) + ":" + kv.Key + "\u0002" + BitConverter.DoubleToInt64Bits(kv.Value).ToString(CultureInfo.InvariantCulture)));
            if (sameConc.TryGetValue(concKey, out var seen)) conc = seen;
            else sameConc[concKey] = conc;
            var ex = extra.ToDictionary(e => e.Name, e => rec[e.Col].Trimmed, StringComparer.Ordinal);
            // A table the plan's columns leave empty is one shared empty table: a plan of 20,000 rows kept five per row.
            rows.Add(new PlanRow(run, fileName, temp, conc, ex.Count == 0 ? NoText : ex, rec.Line)
            {
                Role = role,
                Group = groupCol >= 0 && rec[groupCol].Trimmed.Length > 0 ? rec[groupCol].Trimmed : null,
                Subtract = subtractCol >= 0 && rec[subtractCol].Trimmed.Length > 0 ? rec[subtractCol].Trimmed : null,
                SubtractCell = subtractCol >= 0 ? (rec[subtractCol].Line, rec[subtractCol].Column) : (0, 0),
                Channel = channel, ChannelCell = channelCol >= 0 ? (rec[channelCol].Line, rec[channelCol].Column) : (0, 0),
                FileColumn = rec[fileCol].Column, FileLine = rec[fileCol].Line, Conditions = cond.Count == 0 ? NoConditions : cond, InitialPressures = pressures.Count == 0 ? NoNumbers : pressures,
                ConditionCells = condCells.Count == 0 ? NoIndices : condCells, ConditionLines = condLines.Count == 0 ? NoIndices : condLines,
            });
        }
        if (rows.Count == 0)
            throw Fail.At(file, head.EndLine + 1, 1, "no run rows", "one row per run under the header");
        ResolveBlanks(rows, file);
        return new Plan(file, rows, species.Select(s => s.Name).ToArray())
        {
            HeaderLine = head.Line,
            SpeciesColumns = species.ToDictionary(s => s.Name, s => new PlanColumn(header[s.Col].Trim(), head[s.Col].Column), StringComparer.Ordinal),
            ConditionColumns = conditions.ToDictionary(c => c.Name, c => new PlanColumn(c.Header, head[c.Col].Column), StringComparer.Ordinal),
        };
    }

    /// <summary>Each `subtract` cell names a run id or a group of blank runs; anything else is a located error.</summary>
    private static void ResolveBlanks(List<PlanRow> rows, string file)
    {
        var ids = rows.Select(r => r.Run).ToHashSet(StringComparer.Ordinal);
        for (var i = 0; i < rows.Count; i++)
        {
            var row = rows[i];
            if (row.Subtract is not { } what) continue;
            var (line, column) = row.SubtractCell;
            if (row.Role == "blank")
                throw Fail.At(file, line, column, $"a blank run that subtracts {Fail.Quote(what)}", "an empty subtract cell on a blank run", "only sample runs subtract a blank");
            // a run id, else the well (channel) of a run in the same file, else a group of blank runs
            var well = WellName.Normalise(what);
            string[] members = ids.Contains(what)
                ? [what]
                : rows.FirstOrDefault(r => well is not null && r.File == row.File && WellName.Normalise(r.Channel) == well) is { } byWell
                    ? [byWell.Run]
                    : rows.Where(r => r.Role == "blank" && string.Equals(r.Group, what, StringComparison.Ordinal)).Select(r => r.Run).ToArray();
            if (members.Length == 0)
            {
                var groups = rows.Where(r => r.Role == "blank" && r.Group is not null).Select(r => r.Group!).Distinct(StringComparer.Ordinal).ToList();
                throw Fail.At(file, line, column, Fail.Quote(what), $"a run id, a well of the same file, or a group of blank runs ({(groups.Count == 0 ? "no row has role blank and a group" : "groups: " + string.Join(", ", groups))})",
                    "name the blank run, or give blank rows role \"blank\" and this group");
            }
            if (members.Contains(row.Run))
                throw Fail.At(file, line, column, $"run {Fail.Quote(row.Run)} subtracting itself", "another run, or a group of blank runs");
            rows[i] = row with { BlankRuns = members };
        }
    }

    /// <summary>Decimal commas when the first cell that looks numeric has a comma and no point (and a point, no comma, says decimal points).</summary>
    private static bool LooksDecimalComma(IEnumerable<SetupRecord> rows)
    {
        foreach (var rec in rows)
            foreach (var cell in rec.Cells)
            {
                var t = cell.Trimmed;
                if (t.Length > 0 && (char.IsDigit(t[0]) || t[0] == '-') && t.Contains(',') && !t.Contains('.')) return true;
                if (t.Length > 0 && char.IsDigit(t[0]) && t.Contains('.') && !t.Contains(',')) return false;
            }
        return false;
    }

    /// <summary>A number cell, parsed here with the plan's culture (never by the CSV reader, whose parser accepts group separators).</summary>
    internal static double Number(SetupCell cell, CultureInfo culture, string file)
    {
        var t = cell.Trimmed;
        if (double.TryParse(t, NumberStyles.Float, culture, out var v) && double.IsFinite(v)) return v;
        throw Fail.At(file, cell.Line, cell.Column, Fail.Quote(t), culture.Equals(CultureInfo.InvariantCulture) ? "a number with a decimal point" : "a number with a decimal comma");
    }
}
