namespace TraceKin.Cli;

/// <summary>Process exit codes: 0 all runs analysed, 2 some input rejected, 1 usage error.</summary>
public static class ExitCodes
{
    public const int Ok = 0;
    public const int Usage = 1;
    public const int SomeRejected = 2;
}
