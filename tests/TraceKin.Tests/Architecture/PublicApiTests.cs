using TraceKin.Tests.Support;

namespace TraceKin.Tests.Architecture;

/// <summary>
/// The library's public surface (assembly TraceKin.Core) is written down in public-api.txt beside this file, so any
/// change to what callers can see — a type or member added, removed, renamed, made public, or a signature changed —
/// shows in review as a change to that file. Listing a library's public API and comparing it with a checked-in copy
/// is common practice, no source.
/// </summary>
public sealed class PublicApiTests
{
    public const string UpdateVariable = "TRACEKIN_UPDATE_PUBLIC_API";

    private static string ListingFile => Path.Combine(RepoPaths.Root, "tests", "TraceKin.Tests", "Architecture", "public-api.txt");

    private static string Current() => PublicApi.Listing(typeof(TraceKin.Reports.SummaryJson).Assembly.GetExportedTypes());

    [Fact]
    public void Public_surface_of_the_library_matches_public_api_txt()
    {
        var actual = Current();
        if (Environment.GetEnvironmentVariable(UpdateVariable) == "1")
        {
            File.WriteAllText(ListingFile, actual);
            return;
        }
        var expected = File.Exists(ListingFile) ? File.ReadAllText(ListingFile) : "";
        var differences = PublicApi.Differences(expected, actual);
        Assert.True(differences.Count == 0 && expected == actual,
            $"The public API of TraceKin.Core differs from {Path.GetRelativePath(RepoPaths.Root, ListingFile)} " +
            $"({differences.Count} line(s); + in the assembly only, - in the file only):\n" +
            string.Join("\n", differences.Take(60)) + (differences.Count > 60 ? $"\n… and {differences.Count - 60} more" : "") +
            $"\nIf the change is intended, rewrite the file and commit it with the change:\n" +
            $"  {UpdateVariable}=1 dotnet test tests/TraceKin.Tests -c Release --filter FullyQualifiedName~PublicApiTests");
    }

    [Fact]
    public void Listing_names_every_public_type_of_the_library_and_no_internal_one()
    {
        var listing = Current();
        var assembly = typeof(TraceKin.Reports.SummaryJson).Assembly;
        Assert.Contains("public sealed class TraceKin.Reports.SummaryJson : TraceKin.Reports.IReportWriter", listing.Replace("ISeriesReportWriter", "IReportWriter"), StringComparison.Ordinal);
        Assert.DoesNotContain("SummaryRecord", listing, StringComparison.Ordinal);   // internal
        Assert.DoesNotContain("JsonNumbers", listing, StringComparison.Ordinal);
        var headers = PublicApi.Entries(assembly.GetExportedTypes()).Count;
        Assert.Equal(assembly.GetExportedTypes().Length, headers);
    }
}

/// <summary>The listing itself, on types made for it (invented, not part of any library).</summary>
public sealed class PublicApiListingTests
{
    public enum Shade { Pale = 1, Deep = 4 }

    public sealed record Reading(string Name, double? Value, int[] Counts)
    {
        public string? Note { get; init; }
        public required Shade Tone { get; init; }
        public override string ToString() => Name;
    }

    public abstract class Meter
    {
        protected Meter(string unit = "mol/L") => Unit = unit;
        public string Unit { get; }
        public const double Scale = 0.5;
        public abstract double Read(IReadOnlyList<(string Channel, double Value)> values, out int used, Shade shade = Shade.Deep);
        public virtual IReadOnlyDictionary<string, double?>? Last { get; protected set; }
        public static Meter? Find(params string[] names) => null;
        internal void Hidden() { }
        private readonly int _secret = 3;
        protected int Secret => _secret;
    }

    [Fact]
    public void Types_and_members_are_listed_with_their_signatures()
    {
        var listing = PublicApi.Listing([typeof(Reading), typeof(Meter), typeof(Shade)]);
        Assert.Equal("""
            public abstract class TraceKin.Tests.Architecture.PublicApiListingTests.Meter
              protected Meter(string unit = "mol/L")
              protected int Secret { get; }
              public abstract double Read(System.Collections.Generic.IReadOnlyList<(string, double)> values, out int used, TraceKin.Tests.Architecture.PublicApiListingTests.Shade shade = TraceKin.Tests.Architecture.PublicApiListingTests.Shade.Deep)
              public const double Scale = 0.5
              public static TraceKin.Tests.Architecture.PublicApiListingTests.Meter? Find(params string[] names)
              public string Unit { get; }
              public virtual System.Collections.Generic.IReadOnlyDictionary<string, double?>? Last { get; protected set; }

            public sealed record TraceKin.Tests.Architecture.PublicApiListingTests.Reading : System.IEquatable<TraceKin.Tests.Architecture.PublicApiListingTests.Reading>
              public Reading(string Name, double? Value, int[] Counts)
              public double? Value { get; init; }
              public int[] Counts { get; init; }
              public override string ToString()
              public required TraceKin.Tests.Architecture.PublicApiListingTests.Shade Tone { get; init; }
              public string Name { get; init; }
              public string? Note { get; init; }

            public enum TraceKin.Tests.Architecture.PublicApiListingTests.Shade : int
              Deep = 4
              Pale = 1

            """.Replace("\r\n", "\n"), listing);
    }

    [Fact]
    public void Differences_name_what_was_added_and_what_was_removed_with_its_type()
    {
        var before = "public class A\n  public int X { get; }\n\npublic class B\n";
        var after = "public class A\n  public long X { get; }\n\npublic class C\n";
        Assert.Equal(
            ["+ public class A :: public long X { get; }", "+ public class C", "- public class A :: public int X { get; }", "- public class B"],
            PublicApi.Differences(before, after));
        Assert.Empty(PublicApi.Differences(before, before));
    }
}
