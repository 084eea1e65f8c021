using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>Whether bytes look like a format (content only, never the file name); cheap, looks at the start.</summary>
public delegate bool SniffText(ReadOnlySpan<byte> utf8);

/// <summary>Reads UTF-8 text (already decoded by <see cref="TextDecoding"/>) into a run export, or throws a located <see cref="InputException"/>.</summary>
/// <param name="fastRows">False reads every delimited row by the general path (tests compare the two paths).</param>
public delegate RunExport ReadText(ReadOnlyMemory<byte> utf8, string file, string encoding, IngestSettings settings, bool fastRows);

/// <summary>A text export format: sniffed after decoding, in registry order.</summary>
/// <param name="Name">What the format is, for docs and tests.</param>
/// <param name="Extensions">File extensions (lower case, with the dot) an unplanned file in a series folder is warned about by.</param>
/// <param name="Layout">The <c>ingest.layout</c> value that forces this format without sniffing, or null.</param>
/// <param name="Looks">The content test; the last format in <see cref="ExportFormats.Text"/> takes whatever the others do not.</param>
/// <param name="Read">The reader.</param>
public sealed record TextExportFormat(string Name, IReadOnlyList<string> Extensions, string? Layout, SniffText Looks, ReadText Read);

/// <summary>A binary export format (e.g. a workbook), sniffed from the raw bytes before any text decoding.</summary>
public sealed record BinaryExportFormat(string Name, IReadOnlyList<string> Extensions, Func<ReadOnlyMemory<byte>, bool> Looks,
    Func<ReadOnlyMemory<byte>, string, IngestSettings, bool, RunExport> Read);

/// <summary>
/// The export formats TraceKin reads, in one place and in sniffing order: a new format is its reader file and one line
/// here (and its tests and docs). <see cref="ExportReader"/> dispatches on these lists, <see cref="IngestSettings"/>
/// takes the <c>layout</c> values from them, and the series runner warns about unplanned files by their extensions.
/// </summary>
internal static class ExportFormats
{
    /// <summary>Tried first, on the raw bytes.</summary>
    public static IReadOnlyList<BinaryExportFormat> Binary { get; } =
    [
        new("xlsx workbook", [".xlsx"], SpreadsheetReader.Looks, SpreadsheetReader.Read),
    ];

    /// <summary>Tried in order on the decoded text; the delimited reader, last, is the fallback.</summary>
    public static IReadOnlyList<TextExportFormat> Text { get; } =
    [
        new("JCAMP-DX", [".jdx", ".dx"], null, JcampReader.Looks, (u, f, e, s, _) => JcampReader.Read(u, f, e, s)),
        new("grid of wells", [], "grid", GridReader.Looks, (u, f, e, s, _) => GridReader.Read(u, f, e, s)),
        new("delimited text", [".csv", ".txt", ".tsv", ".dat"], "columns", _ => true, DelimitedReader.Read),
    ];

    /// <summary>Every extension a format claims.</summary>
    public static IReadOnlySet<string> Extensions { get; } =
        Binary.SelectMany(f => f.Extensions).Concat(Text.SelectMany(f => f.Extensions)).ToHashSet(StringComparer.Ordinal);

    /// <summary>The values of <c>ingest.layout</c> besides "auto", in alphabetical order.</summary>
    public static IReadOnlyList<string> Layouts { get; } = Text.Select(f => f.Layout).OfType<string>().Order(StringComparer.Ordinal).ToArray();
}
