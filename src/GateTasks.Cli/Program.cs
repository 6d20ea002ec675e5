using System.Runtime.CompilerServices;

namespace GateTasks.Cli;

internal static class Program
{
    private static int Main(string[] args)
    {
        // First, before the command line's libraries load: on linux-x64 the native executable takes over.
        NativeHandOver.TryExec(args);
        return Run(args);
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private static int Run(string[] args) => CliApp.Run(args, Console.Out, Console.Error);
}
