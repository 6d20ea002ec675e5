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
        // argv as execv takes it: pointers to NUL-terminated strings, then a null pointer; built by hand so the
        // call needs no marshalling code (which the runtime would first have to generate and compile).
        var count = args.Length + 1;
        var argv = Marshal.AllocHGlobal(IntPtr.Size * (count + 1));
        for (var i = 0; i <= count; i++) Marshal.WriteIntPtr(argv, i * IntPtr.Size, IntPtr.Zero);
        try
        {
            Marshal.WriteIntPtr(argv, 0, NativeExecutable.CString(path));
            for (var i = 0; i < args.Length; i++) Marshal.WriteIntPtr(argv, (i + 1) * IntPtr.Size, NativeExecutable.CString(args[i]));
            execv(Marshal.ReadIntPtr(argv), argv); // returns only on failure
        }
        finally
        {
            for (var i = 0; i < count; i++) Marshal.FreeHGlobal(Marshal.ReadIntPtr(argv, i * IntPtr.Size));
            Marshal.FreeHGlobal(argv);
        }
    }

    [DllImport("libc", EntryPoint = "execv")]
    private static extern int execv(IntPtr path, IntPtr argv);
}
