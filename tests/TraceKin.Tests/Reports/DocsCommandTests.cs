using TraceKin.Tests.Support;
using System.Diagnostics;
using System.Text;

namespace TraceKin.Tests.Reports;

/// <summary>
/// Runs every documented `tracekin` command, so the docs cannot rot. Per document: a fresh folder holding a copy of
/// sample-traces/, the files the document shows in fences marked <c>file=PATH</c> written out, and each line starting
/// with "tracekin " (or "dotnet run --project src/TraceKin.Cli -- ") inside a <c>sh</c> fence run by the built CLI in document order, in that folder. Each must exit 0.
/// `tracekin watch` lines run only with --once (otherwise they run until stopped).
/// </summary>
public sealed class DocsCommandTests
{
    public static TheoryData<string> Documents()
    {
        var data = new TheoryData<string> { "docs/cli.md", "docs/tutorial.md" };
        if (File.Exists(Path.Combine(RepoPaths.Root, "README.md"))) data.Add("README.md");
        return data;
    }

    /// <summary>How a documented line invokes the CLI: installed, or from a clone without installing.</summary>
    public static readonly string[] CommandPrefixes = ["tracekin ", "dotnet run --project src/TraceKin.Cli -- "];

    /// <summary>A step of a document: a file to write or a command to run.</summary>
    public sealed record Step(string? FilePath, string? FileText, string[]? Command, int Line);

    public static List<Step> Steps(string markdown)
    {
        var steps = new List<Step>();
        var lines = markdown.Replace("\r\n", "\n").Split('\n');
        string? info = null;
        var block = new StringBuilder();
        var blockStart = 0;
        for (var i = 0; i < lines.Length; i++)
        {
            var line = lines[i];
            if (line.TrimStart().StartsWith("```", StringComparison.Ordinal))
            {
                if (info is null)
                {
                    info = line.TrimStart()[3..].Trim();
                    block.Clear();
                    blockStart = i + 1;
                    continue;
                }
                var words = info.Split(' ', StringSplitOptions.RemoveEmptyEntries);
                var file = words.FirstOrDefault(w => w.StartsWith("file=", StringComparison.Ordinal));
                if (file is not null) steps.Add(new Step(file["file=".Length..], block.ToString(), null, blockStart));
                info = null;
                continue;
            }
            if (info is null) continue;
            block.Append(line).Append('\n');
            var lang = info.Split(' ', 2)[0];
            if (lang is not ("sh" or "bash" or "shell")) continue;
            foreach (var prefix in CommandPrefixes)
                if (line.StartsWith(prefix, StringComparison.Ordinal))
                {
                    steps.Add(new Step(null, null, SplitArgs(line[prefix.Length..]), i + 1));
                    break;
                }
        }
        return steps;
    }

    /// <summary>Splits a command line the way a POSIX shell would for plain words and quoted strings.</summary>
    public static string[] SplitArgs(string text)
    {
        var args = new List<string>();
        var sb = new StringBuilder();
        var inWord = false;
        char quote = '\0';
        foreach (var ch in text)
        {
            if (quote != '\0')
            {
                if (ch == quote) quote = '\0';
                else sb.Append(ch);
            }
            else if (ch is '"' or '\'') { quote = ch; inWord = true; }
            else if (char.IsWhiteSpace(ch))
            {
                if (inWord) { args.Add(sb.ToString()); sb.Clear(); inWord = false; }
            }
            else { sb.Append(ch); inWord = true; }
        }
        if (inWord) args.Add(sb.ToString());
        return args.ToArray();
    }

    [Theory]
    [MemberData(nameof(Documents))]
    public void Every_documented_command_succeeds_on_the_sample(string document)
    {
        var steps = Steps(File.ReadAllText(Path.Combine(RepoPaths.Root, document)));
        var commands = steps.Where(s => s.Command is not null).ToList();
        Assert.True(commands.Count >= (document == "README.md" ? 1 : 3), $"{document}: only {commands.Count} tracekin command(s) found in sh fences");
        var work = RepoPaths.NewTempDir("tracekin-docs");
        try
        {
            foreach (var sub in Directory.EnumerateDirectories(Path.Combine(RepoPaths.Root, "sample-traces")))
                RepoPaths.CopyDir(sub, Path.Combine(work, "sample-traces", Path.GetFileName(sub)));
            foreach (var step in steps)
            {
                if (step.FilePath is not null)
                {
                    var path = Path.Combine(work, step.FilePath);
                    Directory.CreateDirectory(Path.GetDirectoryName(path)!);
                    File.WriteAllText(path, step.FileText);
                    continue;
                }
                var args = step.Command!;
                if (args.Length > 0 && args[0] == "watch" && !args.Contains("--once")) continue;
                var (code, stdout, stderr) = RunCli(args, work);
                Assert.True(code == 0, $"{document}:{step.Line}: `tracekin {string.Join(' ', args)}` exited {code}\n{stderr}\n{stdout}");
                var i = Array.FindIndex(args, a => a is "--out" or "-o");
                if (args.Length > 0 && args[0] == "analyse" && i > 0 && i + 1 < args.Length)
                {
                    var outDir = Path.Combine(work, args[i + 1]);
                    Assert.True(File.Exists(Path.Combine(outDir, "report.html")), $"{document}:{step.Line}: no report.html in {args[i + 1]}");
                    Assert.True(File.Exists(Path.Combine(outDir, "summary.json")), $"{document}:{step.Line}: no summary.json in {args[i + 1]}");
                }
            }
        }
        finally { Directory.Delete(work, recursive: true); }
    }

    [Fact]
    public void Steps_are_read_from_sh_fences_and_file_fences_only()
    {
        var md = "text\n```sh\ntracekin analyse \"my series\" --out r\ndotnet build\n```\n```\ntracekin not-run\n```\n```csv file=a/plan.csv\nrun,file\n```\n";
        var steps = Steps(md);
        Assert.Equal(2, steps.Count);
        Assert.Equal(["analyse", "my series", "--out", "r"], steps[0].Command!);
        Assert.Equal(3, steps[0].Line);
        Assert.Equal(("a/plan.csv", "run,file\n"), (steps[1].FilePath, steps[1].FileText));
    }

    private static (int Code, string Stdout, string Stderr) RunCli(string[] args, string workDir)
    {
        var dll = Path.Combine(AppContext.BaseDirectory, "tracekin.dll");
        var psi = new ProcessStartInfo(Environment.GetEnvironmentVariable("DOTNET_HOST_PATH") ?? "dotnet")
        {
            WorkingDirectory = workDir,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        psi.ArgumentList.Add(dll);
        foreach (var a in args) psi.ArgumentList.Add(a);
        using var p = Process.Start(psi)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(TimeSpan.FromMinutes(3)))
        {
            p.Kill(entireProcessTree: true);
            return (-1, stdout.Result, "timed out after 3 minutes\n" + stderr.Result);
        }
        return (p.ExitCode, stdout.Result, stderr.Result);
    }
}
