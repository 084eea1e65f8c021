using System.Collections.Concurrent;
using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using TraceKin.Setup;

namespace TraceKin.Analysis;

/// <summary>
/// Per-run results kept from one analysis of a series to the next (what `watch` uses): a plan row whose run would be
/// computed from the very same inputs — the export's bytes (SHA-256), the row's every cell and location, the blank
/// rows it subtracts and their exports, and series.toml's text — is not read or analysed again; its kept result is
/// handed to the run sinks and the series stage as if just computed, so every output is the same. Only a result of
/// the pass just run is kept for the next, so memory is bounded by one series. A series whose settings name a
/// calibration file is always analysed in full (that file is no input the key covers). Not for parallel passes of
/// one series; the lookups inside one pass are thread-safe.
/// </summary>
public sealed class RunStore
{
    private ConcurrentDictionary<string, RunResult> _kept = new(StringComparer.Ordinal);
    private ConcurrentDictionary<string, RunResult> _next = new(StringComparer.Ordinal);
    private IReadOnlyDictionary<string, string> _shas = new Dictionary<string, string>();
    private int _reused, _computed;

    /// <summary>Starts a pass over inputs with these SHA-256s (file name as plan.csv writes it → hex digest).</summary>
    public void BeginPass(IReadOnlyDictionary<string, string> inputSha256)
    {
        _shas = inputSha256;
        _next = new(StringComparer.Ordinal);
        _reused = _computed = 0;
    }

    /// <summary>Ends the pass: only what it used or computed is kept for the next.</summary>
    public void EndPass()
    {
        _kept = _next;
        _next = new(StringComparer.Ordinal);
    }

    /// <summary>Runs of the last pass taken from the store, and runs analysed (read and computed).</summary>
    public (int Reused, int Computed) LastPass => (Volatile.Read(ref _reused), Volatile.Read(ref _computed));

    /// <summary>The key of a run's inputs, or null when one of them is not known by its SHA-256 (then it is analysed).</summary>
    internal string? Key(PlanRow row, IReadOnlyList<PlanRow> blanks, SeriesConfig config)
    {
        if (config.Signal.Calibration?.File is not null || config.Text is null) return null;
        var sb = new StringBuilder();
        sb.Append(SettingsHash(config.Text)).Append('\n');
        foreach (var r in blanks.Prepend(row))
        {
            if (!_shas.TryGetValue(r.File, out var sha)) return null;
            sb.Append(sha).Append('\n');
            Describe(sb, r);
        }
        return Hash(sb.ToString());
    }

    internal bool TryTake(string key, out RunResult run)
    {
        if (!_kept.TryGetValue(key, out run!)) return false;
        _next[key] = run;
        Interlocked.Increment(ref _reused);
        return true;
    }

    internal void Keep(string key, RunResult run)
    {
        _next[key] = run;
        Interlocked.Increment(ref _computed);
    }

    internal void Computed() => Interlocked.Increment(ref _computed);

    private sealed record TextHash(string Text, string Hash);
    private TextHash? _settings;

    /// <summary>series.toml's hash, taken once per text (every run of a pass shares it).</summary>
    private string SettingsHash(string text)
    {
        var known = Volatile.Read(ref _settings);
        if (known is not null && ReferenceEquals(known.Text, text)) return known.Hash;
        var made = new TextHash(text, Hash(text));
        Volatile.Write(ref _settings, made);
        return made.Hash;
    }

    private static string Hash(string text) => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(text)));

    /// <summary>Every field of a plan row, locations included (a report names a per-run parameter's plan line).</summary>
    private static void Describe(StringBuilder sb, PlanRow r)
    {
        static string N(double? v) => v?.ToString("R", CultureInfo.InvariantCulture) ?? "-";
        sb.Append(r.Run).Append('\u001f').Append(r.File).Append('\u001f').Append(r.Line).Append(',').Append(r.FileLine).Append(',').Append(r.FileColumn)
            .Append('\u001f').Append(N(r.TemperatureK)).Append('\u001f').Append(r.Channel ?? "-").Append(r.ChannelCell)
            .Append('\u001f').Append(r.Role).Append('\u001f').Append(r.Group ?? "-").Append('\u001f').Append(r.Subtract ?? "-").Append(r.SubtractCell)
            .Append('\u001f').Append(string.Join('\u001e', r.BlankRuns));
        foreach (var (k, v) in r.InitialConcentrations.OrderBy(kv => kv.Key, StringComparer.Ordinal)) sb.Append("\u001fc").Append(k).Append('=').Append(N(v));
        foreach (var (k, v) in r.InitialPressures.OrderBy(kv => kv.Key, StringComparer.Ordinal)) sb.Append("\u001fp").Append(k).Append('=').Append(N(v));
        foreach (var (k, v) in r.Extra.OrderBy(kv => kv.Key, StringComparer.Ordinal)) sb.Append("\u001fx").Append(k).Append('=').Append(v);
        foreach (var (k, v) in r.Conditions.OrderBy(kv => kv.Key, StringComparer.Ordinal))
            sb.Append("\u001fk").Append(k).Append('=').Append(N(v.Value)).Append(v.Header).Append(v.Line).Append(',').Append(v.Column).Append(v.Origin);
        foreach (var (k, v) in r.ConditionCells.OrderBy(kv => kv.Key, StringComparer.Ordinal)) sb.Append("\u001fl").Append(k).Append('=').Append(v).Append(',').Append(r.ConditionLines.GetValueOrDefault(k));
        sb.Append('\n');
    }
}
