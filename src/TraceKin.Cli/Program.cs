using System.CommandLine;
using TraceKin.Cli.Commands;

namespace TraceKin.Cli;

public static class Program
{
    public static int Main(string[] args) => BuildRoot().Parse(args).Invoke();

    public static RootCommand BuildRoot()
    {
        var root = new RootCommand("TraceKin: reaction kinetics from instrument time-course exports — initial rates, integrated-law fits, orders, rate constants, plots and reports.");
        root.Subcommands.Add(AnalyseCommand.Create());
        root.Subcommands.Add(SimulateCommand.Create());
        root.Subcommands.Add(InspectCommand.Create());
        root.Subcommands.Add(WatchCommand.Create());
        root.Subcommands.Add(SuggestCommand.Create());
        root.Subcommands.Add(PlatePlanCommand.Create());
        return root;
    }
}
