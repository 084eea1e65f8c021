using System.Text.RegularExpressions;
using TraceKin.Ingest;
using TraceKin.Tests.Support;
using TraceKin.Traces;

namespace TraceKin.Tests.Ingest;

/// <summary>The registry of export formats: sniffing order, the forced layouts, and the extensions docs/formats.md lists.</summary>
public sealed partial class ExportFormatsTests
{
    private const string Grid = "time (s),0\n,1,2,3\nA,0.10,0.11,0.12\nB,0.20,0.21,0.22\n\ntime (s),30\n,1,2,3\nA,0.13,0.14,0.15\nB,0.23,0.24,0.25\n\ntime (s),60\n,1,2,3\nA,0.16,0.17,0.18\nB,0.26,0.27,0.28\n";

    [Fact]
    public void The_delimited_reader_is_the_last_text_format_and_takes_what_the_others_do_not()
    {
        var last = ExportFormats.Text[^1];
        Assert.Equal("delimited text", last.Name);
        Assert.True(last.Looks("anything at all"u8));
    }

    [Fact]
    public void The_layouts_series_toml_may_force_are_those_of_the_registered_formats()
    {
        Assert.Contains("columns", ExportFormats.Layouts);
        Assert.Contains("grid", ExportFormats.Layouts);
        var ex = Assert.Throws<InputException>(() =>
            TraceKin.Analysis.SeriesConfig.FromText("[signal]\nkind = \"absorbance\"\n[ingest]\nlayout = \"rows\"\n", "series.toml"));
        Assert.Equal("ingest.layout", ex.Problem.Key);
        Assert.Contains("auto, " + string.Join(", ", ExportFormats.Layouts), ex.Problem.Expected);
    }

    [Fact]
    public void A_grid_is_sniffed_as_a_grid_and_the_forced_layout_says_it_was_set()
    {
        var sniffed = ExportReader.FromText(Grid, "plate.csv", IngestSettings.Default);
        var layout = sniffed.Detected.First(d => d.Key == "layout").Value;
        Assert.StartsWith("grid", layout);
        Assert.DoesNotContain("set by ingest.layout", layout);
        var forced = ExportReader.FromText(Grid, "plate.csv", IngestSettings.Default with { Layout = "grid" });
        Assert.EndsWith("(set by ingest.layout)", forced.Detected.First(d => d.Key == "layout").Value);
        Assert.Equal(sniffed.Channels.Count, forced.Channels.Count);
    }

    [Fact]
    public void Every_extension_a_format_claims_is_listed_in_the_docs_and_no_other()
    {
        var text = File.ReadAllText(Path.Combine(RepoPaths.Docs, "formats.md"));
        var m = ExtensionList().Match(text.Replace("\n", " "));
        Assert.True(m.Success, "docs/formats.md no longer lists the export-like extensions");
        var documented = m.Groups[1].Value.Split(',', StringSplitOptions.TrimEntries).ToHashSet();
        Assert.Equal(documented.Order(), ExportFormats.Extensions.Order());
    }

    [GeneratedRegex(@"export-like extensions\s+\(([^)]*)\)")]
    private static partial Regex ExtensionList();
}
