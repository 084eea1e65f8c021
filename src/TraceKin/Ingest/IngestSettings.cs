using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// The [ingest] table of series.toml: format decisions a user may force when a file is ambiguous.
/// Null means "detect"; every detected decision is listed in <c>RunExport.Detected</c>.
/// </summary>
public sealed record IngestSettings
{
    /// <summary>"comma", "semicolon", "tab" or "whitespace".</summary>
    public string? Delimiter { get; init; }
    /// <summary>"point" or "comma".</summary>
    public string? DecimalSeparator { get; init; }
    /// <summary>"utf-8", "utf-16le", "utf-16be", "windows-1252" or "latin-1".</summary>
    public string? Encoding { get; init; }
    /// <summary>Header of the time column, when it is not the first time-like column.</summary>
    public string? TimeColumn { get; init; }
    /// <summary>1-based number of the header line, when the preamble confuses detection.</summary>
    public int? HeaderLine { get; init; }
    /// <summary>"auto" (a preamble key such as "mixed at" when present, else the first sample), "first-sample" or "metadata".</summary>
    public string TimeZero { get; init; } = "auto";
    /// <summary>Preamble key holding the moment of mixing, when it is not one of the keys TraceKin knows.</summary>
    public string? TimeZeroKey { get; init; }
    /// <summary>"error" (default), "average" (rows sharing a time are averaged) or "first" (later duplicates dropped).</summary>
    public string DuplicateTimes { get; init; } = "error";
    /// <summary>
    /// "error" (default): an export whose last row is incomplete (fewer cells than the header, or a number cut short at
    /// the very end of the file) is rejected; "drop": that row is left out with a located warning.
    /// </summary>
    public string CutLastRow { get; init; } = "error";
    /// <summary>Absorbance at or above which a run of identical values is taken as a saturated detector; 0 turns the check off.</summary>
    public double SaturationAbsorbance { get; init; } = 2.5;
    /// <summary>How many identical consecutive values make a saturation plateau.</summary>
    public int SaturationPoints { get; init; } = 3;
    /// <summary>Column headers to skip (sample numbers, comments).</summary>
    public IReadOnlyList<string> IgnoreColumns { get; init; } = [];

    /// <summary>Unit of a well's readings when its header gives none (a column "B7", a grid of wells): "AU" by default.</summary>
    public string WellUnit { get; init; } = "AU";
    /// <summary>"auto" (sniffed), "columns" (a time column, then one column per channel or well) or "grid" (one grid
    /// of wells per reading, the reading's time above it).</summary>
    public string Layout { get; init; } = "auto";

    /// <summary>The sheet of an .xlsx workbook to read, by name or 1-based number; null: the first sheet holding a number.</summary>
    public string? Sheet { get; init; }

    public static IngestSettings Default { get; } = new();

    public static IngestSettings FromToml(TomlSection s)
    {
        var result = new IngestSettings
        {
            Delimiter = s.Has("delimiter") ? s.Choice("delimiter", "comma", "comma", "semicolon", "tab", "whitespace") : null,
            DecimalSeparator = s.Has("decimal") ? s.Choice("decimal", "point", "point", "comma") : null,
            Encoding = s.Has("encoding") ? s.Choice("encoding", "utf-8", "utf-8", "utf-16le", "utf-16be", "windows-1252", "latin-1") : null,
            TimeColumn = s.String("time_column"),
            HeaderLine = s.Int("header_line"),
            TimeZero = s.Choice("time_zero", "auto", "auto", "first-sample", "metadata"),
            TimeZeroKey = s.String("time_zero_key"),
            DuplicateTimes = s.Choice("duplicate_times", "error", "error", "average", "first"),
            CutLastRow = s.Choice("cut_last_row", "error", "error", "drop"),
            SaturationAbsorbance = s.Double("saturation_absorbance", 2.5),
            SaturationPoints = s.Int("saturation_points") ?? 3,
            IgnoreColumns = s.Strings("ignore_columns") ?? [],
            WellUnit = s.String("well_unit") ?? "AU",
            Layout = s.Choice("layout", "auto", ["auto", .. ExportFormats.Layouts]),
            Sheet = s.String("sheet"),
        };
        if (Units.Find(result.WellUnit) is not { Quantity: Quantity.Absorbance or Quantity.GasVolume or Quantity.Pressure or Quantity.Conductivity or Quantity.Concentration })
            throw Traces.Fail.Setting(s.File, s.KeyName("well_unit"), Traces.Fail.Quote(result.WellUnit), "a signal unit, e.g. \"AU\", \"mS/cm\", \"kPa\"");
        if (result.HeaderLine is < 1)
            throw Traces.Fail.Setting(s.File, s.KeyName("header_line"), result.HeaderLine.Value.ToString(System.Globalization.CultureInfo.InvariantCulture), "a line number of 1 or more");
        if (result.SaturationAbsorbance < 0)
            throw Traces.Fail.Setting(s.File, s.KeyName("saturation_absorbance"), result.SaturationAbsorbance.ToString(System.Globalization.CultureInfo.InvariantCulture), "0 (off) or a positive absorbance");
        if (result.SaturationPoints < 2)
            throw Traces.Fail.Setting(s.File, s.KeyName("saturation_points"), result.SaturationPoints.ToString(System.Globalization.CultureInfo.InvariantCulture), "a whole number of 2 or more");
        return result;
    }
}
