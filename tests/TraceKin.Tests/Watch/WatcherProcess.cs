using System.Diagnostics;
using System.Text;

namespace TraceKin.Tests.Watch;

/// <summary>`tracekin watch` started as a separate process (the built tracekin.dll under `dotnet`), its stderr kept.</summary>
public sealed class WatcherProcess : IDisposable
{
    private readonly Process _process;
    private readonly StringBuilder _stderr = new();

    private WatcherProcess(Process process) => _process = process;

    public string Stderr
    {
        get { lock (_stderr) return _stderr.ToString(); }
    }

    public static WatcherProcess Start(params string[] args)
    {
        var psi = new ProcessStartInfo("dotnet")
        {
            RedirectStandardError = true,
            RedirectStandardOutput = true,
            UseShellExecute = false,
        };
        psi.ArgumentList.Add(CliDll());
        foreach (var a in args) psi.ArgumentList.Add(a);
        var p = new Process { StartInfo = psi };
        var w = new WatcherProcess(p);
        p.ErrorDataReceived += (_, e) => { if (e.Data is not null) lock (w._stderr) w._stderr.AppendLine(e.Data); };
        p.OutputDataReceived += (_, _) => { };
        p.Start();
        p.BeginErrorReadLine();
        p.BeginOutputReadLine();
        return w;
    }

    /// <summary>Waits until the watcher holds its lock and is watching (its first status line).</summary>
    public void WaitUntilWatching(TimeSpan timeout)
    {
        var until = DateTime.UtcNow + timeout;
        while (!Stderr.Contains("(Ctrl+C to stop)", StringComparison.Ordinal))
        {
            if (_process.HasExited) throw new InvalidOperationException($"the watcher exited with {_process.ExitCode}; stderr:\n{Stderr}");
            if (DateTime.UtcNow > until) throw new TimeoutException($"the watcher did not start within {timeout.TotalSeconds} s; stderr:\n{Stderr}");
            Thread.Sleep(20);
        }
    }

    /// <summary>Like SIGKILL: no clean-up of any kind runs in the watcher.</summary>
    public void Kill()
    {
        if (!_process.HasExited) _process.Kill(entireProcessTree: true);
        _process.WaitForExit();
    }

    public int WaitForExit(TimeSpan timeout)
    {
        if (!_process.WaitForExit(timeout))
        {
            Kill();
            throw new TimeoutException($"the watcher did not finish within {timeout.TotalSeconds} s; stderr:\n{Stderr}");
        }
        _process.WaitForExit();
        return _process.ExitCode;
    }

    public void Dispose()
    {
        Kill();
        _process.Dispose();
    }

    /// <summary>The CLI built next to this test assembly's configuration (src/TraceKin.Cli/bin/CONFIG/TFM/).</summary>
    public static string CliDll()
    {
        var baseDir = AppContext.BaseDirectory;
        var tfm = new DirectoryInfo(baseDir).Name;
        var config = new DirectoryInfo(baseDir).Parent!.Name;
        for (var dir = new DirectoryInfo(baseDir); dir is not null; dir = dir.Parent)
        {
            if (!File.Exists(Path.Combine(dir.FullName, "TraceKin.sln"))) continue;
            var dll = Path.Combine(dir.FullName, "src", "TraceKin.Cli", "bin", config, tfm, "tracekin.dll");
            if (File.Exists(dll)) return dll;
        }
        var beside = Path.Combine(baseDir, "tracekin.dll");
        if (File.Exists(beside) && File.Exists(Path.Combine(baseDir, "tracekin.runtimeconfig.json"))) return beside;
        throw new FileNotFoundException("tracekin.dll not found; build the solution first");
    }
}
