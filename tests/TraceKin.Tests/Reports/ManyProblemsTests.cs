using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Tests.Support;
using TraceKin.Traces;

namespace TraceKin.Tests.Reports;

/// <summary>A large batch with many problems: the report's first screen says what kinds went wrong, not a wall of lines.</summary>
public sealed class ManyProblemsTests
{
    [Fact]
    public void Beyond_the_limit_problems_are_summed_up_by_kind_and_the_full_list_is_folded()
    {
        using var dir = new RepoPaths.TempDir();
        var warnings = Enumerable.Range(1, 40).Select(i => new Warning("rate-unresolved", $"run_{i:000}", "the estimates differ"))
            .Concat(Enumerable.Range(1, 3).Select(i => new Warning("spikes", $"run_{i:000}", "1 sample(s) excluded"))).ToList();
        var r = new SeriesResult(dir.Path, null, null, [], [], null, warnings, "test");
        var html = ReportHtml.Render(r, null);
        Assert.Contains("40 × rate-unresolved", html);
        Assert.Contains("run_001, run_002, run_003, run_004, run_005 and 35 more", html);
        Assert.Contains("<details class=\"all-problems\">", html);
        // Every problem is still in the page, each once in the folded list.
        Assert.Equal(40, html.Split("data-code=\"rate-unresolved\"").Length - 1 - 1);
    }

    [Fact]
    public void A_few_problems_are_listed_one_by_one()
    {
        using var dir = new RepoPaths.TempDir();
        var warnings = Enumerable.Range(1, 5).Select(i => new Warning("rate-unresolved", $"run_{i}", "the estimates differ")).ToList();
        var html = ReportHtml.Render(new SeriesResult(dir.Path, null, null, [], [], null, warnings, "test"), null);
        Assert.DoesNotContain("all-problems", html);
        Assert.Equal(5, html.Split("data-code=\"rate-unresolved\"").Length - 1);
    }
}
