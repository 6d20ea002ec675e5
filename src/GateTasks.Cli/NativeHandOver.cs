using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace GateTasks.Cli;

/// <summary>
/// At the start of the portable tool, replaces the process by the native executable (execv: same process id, standard
/// streams, environment, exit code and signals) where <see cref="NativeExecutable"/> finds it usable. Returns when it
/// is not, or when execv fails; the portable tool then runs as it always did.
/// </summary>
internal static class NativeHandOver
{
    public static void TryExec(string[] args)
    {
        // The native executable is this same program compiled ahead of time: it never hands over.
        if (!RuntimeFeature.IsDynamicCodeSupported) return;
        if (NativeExecutable.UsableIn(AppContext.BaseDirectory) is not { } path) return;
        var strings = new IntPtr[args.Length + 2];
        try
        {
            strings[0] = Marshal.StringToCoTaskMemUTF8(path);
            for (var i = 0; i < args.Length; i++) strings[i + 1] = Marshal.StringToCoTaskMemUTF8(args[i]);
            execv(strings[0], strings); // returns only on failure
        }
        finally
        {
            foreach (var s in strings) Marshal.FreeCoTaskMem(s);
        }
    }

    [DllImport("libc", EntryPoint = "execv", SetLastError = true)]
    private static extern int execv(IntPtr path, IntPtr[] argv);
}
