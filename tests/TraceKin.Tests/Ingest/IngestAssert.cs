using TraceKin.Ingest;
using TraceKin.Traces;

namespace TraceKin.Tests.Ingest;

/// <summary>Small helpers so each ingest test reads as one sentence.</summary>
internal static class IngestAssert
{
    public static RunExport Read(string text, IngestSettings? settings = null, string file = "run.csv") =>
        ExportReader.FromText(text, file, settings ?? IngestSettings.Default);

    public static RunExport ReadBytes(byte[] bytes, IngestSettings? settings = null, string file = "run.csv") =>
        ExportReader.FromBytes(bytes, file, settings ?? IngestSettings.Default);

    public static Problem Rejects(string text, IngestSettings? settings = null, string file = "run.csv") =>
        Assert.Throws<InputException>(() => Read(text, settings, file)).Problem;

    public static Problem RejectsBytes(byte[] bytes, IngestSettings? settings = null, string file = "run.csv") =>
        Assert.Throws<InputException>(() => ReadBytes(bytes, settings, file)).Problem;

    public static string Detected(RunExport run, string key) =>
        run.Detected.Single(d => d.Key == key).Value;

    /// <summary>Runs <paramref name="body"/> with CurrentCulture set to <paramref name="culture"/>, restoring it after.</summary>
    public static T UnderCulture<T>(string culture, Func<T> body)
    {
        var saved = System.Globalization.CultureInfo.CurrentCulture;
        var savedUi = System.Globalization.CultureInfo.CurrentUICulture;
        try
        {
            System.Globalization.CultureInfo.CurrentCulture = System.Globalization.CultureInfo.GetCultureInfo(culture);
            System.Globalization.CultureInfo.CurrentUICulture = System.Globalization.CultureInfo.GetCultureInfo(culture);
            return body();
        }
        finally
        {
            System.Globalization.CultureInfo.CurrentCulture = saved;
            System.Globalization.CultureInfo.CurrentUICulture = savedUi;
        }
    }
}
