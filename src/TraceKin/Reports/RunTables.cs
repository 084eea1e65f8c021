using TraceKin.Analysis;
using TraceKin.Rates;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Reports;

/// <summary>
/// The tidy per-run tables beside runs.csv, one observation per row and the unit of every number in its column's
/// header (or, where the unit differs from row to row, in a unit column beside it) — for a spreadsheet, pandas or R:
/// <list type="bullet">
/// <item><c>law-fits.csv</c>: one row per run and fitted integrated law (fit quality, AICc, Akaike weight, chosen, exit);</item>
/// <item><c>law-parameters.csv</c>: one row per run, law and parameter (value, standard error, unit, varied);</item>
/// <item><c>initial-rates.csv</c>: one row per run and initial-rate estimator (rate, standard errors, window, dof, chosen);</item>
/// <item><c>spikes.csv</c>: one row per sample excluded as a spike (time, concentration).</item>
/// </list>
/// Used as a run sink (<see cref="Begin"/>, <see cref="Accept"/>), the rows are written as the runs finish: each
/// run's rows are formatted on its worker, then appended in plan order to temporary files (a run that finishes early
/// waits, as a few formatted rows, for the ones before it), and <see cref="Write"/> renames the files into place, so
/// no series is ever held whole for these tables and a reader never sees half a file. Without the sink (library use)
/// <see cref="Write"/> writes them from the result. Columns: docs/formats.md, "Per-run tables".
/// </summary>
public sealed class RunTables : IRunSink, ISeriesReportWriter, IDisposable
{
    public const string FitsFile = "law-fits.csv";
    public const string ParametersFile = "law-parameters.csv";
    public const string RatesFile = "initial-rates.csv";
    public const string SpikesFile = "spikes.csv";
    public static readonly string[] FileNames = [FitsFile, ParametersFile, RatesFile, SpikesFile];

    public IReadOnlyList<string> Files => FileNames;

    private static readonly string RateHeaderUnit = $"({Units.RateUnit})";

    public static readonly string[] FitsHeader =
    [
        "run", "law", "drift term", "chosen", "exit", "converged", "points", "dof", "r squared", "AICc", "BIC", "delta AICc",
        "Akaike weight", "half-life (s)", "half-life std error (s)", "runs test p", "lack of fit", "excluded because",
    ];
    public static readonly string[] ParametersHeader = ["run", "law", "parameter", "value", "std error", "unit", "varied"];
    public static readonly string[] RatesHeader =
    [
        "run", "estimator", "method", "chosen", $"initial rate {RateHeaderUnit}", $"std error {RateHeaderUnit}",
        $"model std error {RateHeaderUnit}", $"systematic std error {RateHeaderUnit}", "dof", "points", "window start (s)", "window end (s)",
    ];
    public static readonly string[] SpikesHeader = ["run", "time (s)", "concentration (mol/L)"];

    private readonly CsvStyle _style;
    private readonly string? _outDir, _root;
    private readonly object _gate = new();
    // Streaming state: the open files, the next plan slot to append, and the formatted rows of runs that finished early.
    private PendingFile[]? _files;
    private Dictionary<string, int>? _slotOf;
    private readonly Dictionary<int, byte[][]> _waiting = [];
    private int _next, _slots;
    private Exception? _failure;

    /// <summary>Tables written from the whole result by <see cref="Write"/>.</summary>
    public RunTables(CsvStyle style = CsvStyle.Standard) => _style = style;

    /// <summary>Tables streamed into <paramref name="outDir"/> as runs finish (attach as the run sink), finished by <see cref="Write"/>.</summary>
    /// <param name="root">The output folder the files must stay inside (see <see cref="AtomicFile"/>); default <paramref name="outDir"/>.</param>
    public RunTables(string outDir, CsvStyle style = CsvStyle.Standard, string? root = null)
    {
        _style = style;
        _outDir = outDir;
        _root = root ?? outDir;
    }

    public void Begin(Plan plan)
    {
        if (_outDir is null) return;
        lock (_gate)
        {
            Abandon();
            _failure = null;
            _waiting.Clear();
            _next = 0;
            _slots = plan.Rows.Count;
            _slotOf = plan.Rows.Select((r, i) => (r.Run, i)).ToDictionary(x => x.Run, x => x.i, StringComparer.Ordinal);
            try
            {
                var opened = new List<PendingFile>();
                _files = [];
                foreach (var f in FileNames)
                {
                    opened.Add(AtomicFile.Begin(Path.Combine(_outDir, f), _root));
                    _files = [.. opened];
                }
                var headers = Headers(_style);
                for (var k = 0; k < _files.Length; k++) _files[k].Stream.Write(headers[k]);
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or OutputPathException)
            {
                Fail(ex);
            }
        }
    }

    public void Accept(RunResult run)
    {
        if (_outDir is null) return;
        var rows = Format(run, _style); // on the worker, outside the lock
        Done(run.Id, rows);
    }

    public void Rejected(PlanRow row)
    {
        if (_outDir is null) return;
        Done(row.Run, null);
    }

    /// <summary>
    /// Finishes the tables: streamed ones are renamed into place (every run the sink saw is in them, in plan order);
    /// otherwise they are written from <paramref name="result"/>. Throws <see cref="IOException"/> when a streamed file
    /// could not be written, so the failure is reported like any other output's.
    /// </summary>
    public void Write(SeriesResult result, string outDir)
    {
        lock (_gate)
        {
            if (_files is not null && _outDir is not null && Path.GetFullPath(outDir) == Path.GetFullPath(_outDir))
            {
                try
                {
                    if (_failure is null)
                    {
                        // Slots never reported (a run stopped by cancellation) are passed over, in order.
                        while (_next < _slots) { _waiting.Remove(_next, out var rest); Append(rest); _next++; }
                        foreach (var f in _files) f.Commit();
                    }
                }
                catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or OutputPathException) { Fail(ex); }
                finally { Abandon(); }
                if (_failure is { } failure)
                    throw new IOException($"the per-run tables could not be written: {failure.Message}", failure);
                return;
            }
        }
        var files = new List<PendingFile>();
        try
        {
            foreach (var f in FileNames) files.Add(AtomicFile.Begin(Path.Combine(outDir, f), outDir));
            var headers = Headers(_style);
            for (var k = 0; k < files.Count; k++) files[k].Stream.Write(headers[k]);
            foreach (var run in result.Runs)
            {
                var rows = Format(run, _style);
                for (var k = 0; k < files.Count; k++) files[k].Stream.Write(rows[k]);
            }
            foreach (var f in files) f.Commit();
        }
        finally
        {
            foreach (var f in files) f.Dispose();
        }
    }

    public void Dispose()
    {
        lock (_gate) Abandon();
    }

    private void Done(string runId, byte[][]? rows)
    {
        lock (_gate)
        {
            if (_files is null || _failure is not null || _slotOf is null || !_slotOf.TryGetValue(runId, out var slot)) return;
            if (slot != _next)
            {
                _waiting[slot] = rows ?? [];
                return;
            }
            try
            {
                Append(rows);
                _next++;
                while (_waiting.Remove(_next, out var later))
                {
                    Append(later);
                    _next++;
                }
                // every slot is written: the run names are not needed to place rows any more
                if (_next == _slots) _slotOf = null;
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException) { Fail(ex); }
        }
    }

    private void Append(byte[][]? rows)
    {
        if (rows is null || rows.Length == 0 || _files is null) return;
        for (var k = 0; k < _files.Length; k++) _files[k].Stream.Write(rows[k]);
    }

    private void Fail(Exception ex)
    {
        _failure ??= ex;
        _waiting.Clear();
    }

    private void Abandon()
    {
        if (_files is null) return;
        foreach (var f in _files) f.Dispose();
        _files = null;
    }

    private static byte[][] Headers(CsvStyle style) =>
    [
        Bytes(style, t => t.Header(FitsHeader)),
        Bytes(style, t => t.Header(ParametersHeader)),
        Bytes(style, t => t.Header(RatesHeader)),
        Bytes(style, t => t.Header(SpikesHeader)),
    ];

    /// <summary>One run's rows of each table, as the bytes they take in the file.</summary>
    internal static byte[][] Format(RunResult run, CsvStyle style)
    {
        var rates = run.Rates;
        var fits = Bytes(style, t =>
        {
            foreach (var f in rates.Fits)
            {
                var fit = f.Fit;
                t.Text(run.Id).Text(f.Law).Bool(f.Drift).Bool(f.Chosen).Text(fit.Exit.ToString()).Bool(fit.Converged)
                    .Integer(fit.PointCount).Integer(fit.DegreesOfFreedom).Number(fit.RSquared).Number(fit.AicC).Number(fit.Bic)
                    .Number(f.DeltaAicc).Number(f.AkaikeWeight).Number(f.HalfLife).Number(f.HalfLifeStdError).Number(f.Runs?.PValue)
                    .Bool(f.LackOfFit).Text(f.ExcludedBecause ?? "");
                t.EndRow();
            }
        });
        var parameters = Bytes(style, t =>
        {
            foreach (var f in rates.Fits)
                foreach (var p in f.Fit.Parameters)
                {
                    t.Text(run.Id).Text(f.Law).Text(p.Name).Number(p.Value).Number(p.StdError).Text(ParameterUnit(f, p.Name)).Bool(p.Varied);
                    t.EndRow();
                }
        });
        var relSys = run.Converted.RelativeSystematicUncertainty;
        var estimates = Bytes(style, t =>
        {
            foreach (var e in rates.Estimates)
            {
                if (e.Unit != Units.RateUnit)
                    throw new InvalidOperationException($"an initial rate in {e.Unit}; the table's columns are in {Units.RateUnit}");
                t.Text(run.Id).Text(Estimator(e.Method)).Text(e.Method).Bool(ReferenceEquals(e, rates.Headline))
                    .Number(e.Value).Number(e.StdError).Number(e.ModelStdError).Number(Math.Abs(e.Value) * relSys)
                    .Integer(e.Dof).Integer(e.PointsUsed).Number(e.WindowStart).Number(e.WindowEnd);
                t.EndRow();
            }
        });
        // The rates stage works on the concentration trace in mol/L (Rates/RateAnalysis), so a spike's value is one.
        var spikes = Bytes(style, t =>
        {
            foreach (var sp in rates.Spikes)
            {
                t.Text(run.Id).Number(sp.Time).Number(sp.Value);
                t.EndRow();
            }
        });
        return [fits, parameters, estimates, spikes];
    }

    /// <summary>The short name of an estimator, as <c>rates.method</c> names it: law, polynomial or line.</summary>
    public static string Estimator(string method) =>
        method.StartsWith("integrated law", StringComparison.Ordinal) ? "law"
        : method.StartsWith("polynomial", StringComparison.Ordinal) ? "polynomial"
        : method.StartsWith("straight line", StringComparison.Ordinal) ? "line"
        : "other";

    /// <summary>
    /// The unit of a law parameter: the model is y(t) = yEnd + (y0 − yEnd)·u(t) (+ drift·t) on the concentration
    /// trace in mol/L (Rates/LawModel), so y0, yEnd and a partner's [B]0 are in mol/L, drift in mol/(L·s), k in the
    /// law's unit of the rate constant and the order n is a pure number.
    /// </summary>
    public static string ParameterUnit(LawFit fit, string parameter) => parameter switch
    {
        "y0" or "yEnd" or "[B]0" => "mol/L",
        "drift" => Units.RateUnit,
        "k" => fit.RateConstantUnit,
        "n" => "1",
        _ => "",
    };

    private static byte[] Bytes(CsvStyle style, Action<CsvTable> write)
    {
        using var ms = new MemoryStream();
        using (var table = new CsvTable(ms, style, leaveOpen: true)) write(table);
        return ms.ToArray();
    }
}
