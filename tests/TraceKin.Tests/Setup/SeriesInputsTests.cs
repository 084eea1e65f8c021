using TraceKin.Setup;

namespace TraceKin.Tests.Setup;

// How a path from plan.csv is resolved: symbolic links followed and "." and ".." applied in the order POSIX
// path resolution applies them (POSIX.1-2017, XBD 4.13 "Pathname Resolution": a ".." after a link leaves the
// link's target). Robustness tests on a temporary folder.
public sealed class SeriesInputsTests : IDisposable
{
    private readonly string _root = Directory.CreateTempSubdirectory("tracekin-paths-").FullName;

    public void Dispose() => Directory.Delete(_root, recursive: true);

    [Fact]
    public void A_dot_dot_after_a_link_leaves_the_links_target_not_the_link()
    {
        Directory.CreateDirectory(Path.Combine(_root, "series"));
        Directory.CreateDirectory(Path.Combine(_root, "elsewhere", "deep"));
        File.WriteAllText(Path.Combine(_root, "elsewhere", "x.csv"), "1");
        Directory.CreateSymbolicLink(Path.Combine(_root, "series", "d"), Path.Combine(_root, "elsewhere", "deep"));
        // lexically series/d/../x.csv is series/x.csv; the operating system opens elsewhere/x.csv
        Assert.Equal(Path.Combine(_root, "elsewhere", "x.csv"), SeriesInputs.RealPath(Path.Combine(_root, "series", "d", "..", "x.csv")));
        var refusal = SeriesInputs.Check(Path.Combine(_root, "series"), "d/../x.csv", allowOutside: false, 1 << 20, out _);
        Assert.NotNull(refusal);
        Assert.Contains("outside the series folder", refusal.Found);
    }

    [Fact]
    public void A_chain_of_relative_links_is_followed_to_its_end()
    {
        File.WriteAllText(Path.Combine(_root, "data.csv"), "1");
        File.CreateSymbolicLink(Path.Combine(_root, "b.csv"), "data.csv");
        File.CreateSymbolicLink(Path.Combine(_root, "a.csv"), "b.csv");
        Assert.Equal(Path.Combine(_root, "data.csv"), SeriesInputs.RealPath(Path.Combine(_root, "a.csv")));
        Assert.Null(SeriesInputs.Check(_root, "a.csv", allowOutside: false, 1 << 20, out var path));
        Assert.Equal(Path.Combine(_root, "data.csv"), path); // the real path is what gets opened
    }

    [Fact]
    public void A_loop_of_links_is_refused_not_followed_for_ever()
    {
        File.CreateSymbolicLink(Path.Combine(_root, "a.csv"), "b.csv");
        File.CreateSymbolicLink(Path.Combine(_root, "b.csv"), "a.csv");
        var refusal = SeriesInputs.Check(_root, "a.csv", allowOutside: false, 1 << 20, out _);
        Assert.NotNull(refusal);
        Assert.Contains("cannot be resolved (more than 40 symbolic links)", refusal.Found);
    }

    [Fact]
    public void A_name_that_only_starts_like_the_folder_is_not_inside_it()
    {
        // "/x/series-old/r.csv" begins with the characters "/x/series" but is not in /x/series
        Assert.False(SeriesInputs.IsWithin(Path.Combine(_root, "series-old", "r.csv"), Path.Combine(_root, "series")));
        Assert.True(SeriesInputs.IsWithin(Path.Combine(_root, "series", "r.csv"), Path.Combine(_root, "series")));
    }

    [Fact]
    public void A_file_of_the_limit_passes_and_one_byte_more_is_refused()
    {
        var path = Path.Combine(_root, "r.csv");
        using (var fs = File.Create(path)) fs.SetLength(4096);
        Assert.Null(SeriesInputs.Check(_root, "r.csv", allowOutside: false, 4096, out _));
        Assert.Equal("at most 4,095 bytes", SeriesInputs.Check(_root, "r.csv", allowOutside: false, 4095, out _)!.Expected);
    }
}
