using System;
using System.IO;
using System.Runtime.InteropServices;
using System.Text;

namespace GateTasks.Cli;

/// <summary>
/// The tool compiled ahead of time for linux-x64 that both packages carry beside the portable files
/// (NativeExecutable.targets), and whether this machine can run it. The portable entry (NativeHandOver) and the MSBuild
/// task's EngineProcess (which compiles this file too) decide alike. Anything that cannot be checked counts as "no":
/// the portable files then run, as they do everywhere else.
/// </summary>
internal static class NativeExecutable
{
    /// <summary>Where it lies, relative to the folder of <c>gatetasks.dll</c>.</summary>
    public const string RelativePath = "runtimes/linux-x64/native/gatetasks";

    /// <summary>Set to anything but <c>0</c> or empty, the portable files run even where the native executable could.</summary>
    public const string PortableVariable = "GATETASKS_PORTABLE";

    /// <summary>
    /// The newest glibc symbol version the executable needs (the C library of the machine that packs; the package
    /// tests read the packed executable's needs and fail when they exceed this).
    /// </summary>
    public static readonly Version GlibcNeeded = new(2, 34);

    // What the compile's instruction set (x86-64-v3, GateTasks.Cli.csproj) needs; the executable refuses to start
    // without it. Asked of the runtime (which asks the CPU and the OS) by name, since the MSBuild task compiles for
    // netstandard2.0, which has no such types; the two that .NET 8 does not name, as /proc/cpuinfo names them.
#if !NET
    private static readonly string[] RuntimeInstructionSets = ["Avx", "Avx2", "Bmi1", "Bmi2", "Fma", "Lzcnt"];
    private static readonly string[] CpuFlags = ["f16c", "movbe"];
#endif

    /// <summary>The executable's full path when this machine can run it, else null.</summary>
    public static string? UsableIn(string portableDirectory)
    {
        try
        {
            var forced = Environment.GetEnvironmentVariable(PortableVariable);
            if (!string.IsNullOrEmpty(forced) && forced != "0") return null;
            if (!RuntimeInformation.IsOSPlatform(OSPlatform.Linux) || RuntimeInformation.OSArchitecture != Architecture.X64
                || RuntimeInformation.ProcessArchitecture != Architecture.X64)
                return null;
            var path = Path.Combine(portableDirectory, RelativePath);
            if (!File.Exists(path) || !CpuHasInstructionSets() || !GlibcAtLeast(GlibcNeeded) || !LibrariesLoad()) return null;
            return Executable(path) ? Path.GetFullPath(path) : null;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or DllNotFoundException
                                      or EntryPointNotFoundException or FormatException or ArgumentException
                                      or OverflowException or NotSupportedException
                                      or System.Reflection.TargetInvocationException)
        {
            return null;
        }
    }

    private static bool CpuHasInstructionSets()
    {
#if NET
        // Asked directly where the types exist (the tool): the start of every portable run pays for this, and
        // reflection and reading /proc/cpuinfo cost milliseconds of JIT compiling there (the entry assembly has no
        // precompiled code).
        if (!(System.Runtime.Intrinsics.X86.Avx.IsSupported && System.Runtime.Intrinsics.X86.Avx2.IsSupported
              && System.Runtime.Intrinsics.X86.Bmi1.IsSupported && System.Runtime.Intrinsics.X86.Bmi2.IsSupported
              && System.Runtime.Intrinsics.X86.Fma.IsSupported && System.Runtime.Intrinsics.X86.Lzcnt.IsSupported))
            return false;
        return CpuHasMovbeAndF16c();
#else
        foreach (var name in RuntimeInstructionSets)
            if (Type.GetType("System.Runtime.Intrinsics.X86." + name + ", System.Private.CoreLib")?.GetProperty("IsSupported")?.GetValue(null) is not true)
                return false;
        return CpuHasFlags();
#endif
    }

#if NET
    /// <summary>
    /// Whether the CPU reports MOVBE and F16C: CPUID leaf 1, ECX bits 22 and 29 (Intel SDM vol. 2A, CPUID, the
    /// feature information returned in ECX; the kernel shows the same bits as /proc/cpuinfo's movbe and f16c).
    /// </summary>
    internal static bool CpuHasMovbeAndF16c()
    {
        if (!System.Runtime.Intrinsics.X86.X86Base.IsSupported) return false;
        var ecx = System.Runtime.Intrinsics.X86.X86Base.CpuId(1, 0).Ecx;
        return (ecx & (1 << 22)) != 0 && (ecx & (1 << 29)) != 0;
    }
#else
    private static bool CpuHasFlags()
    {
        foreach (var line in File.ReadLines("/proc/cpuinfo"))
        {
            if (!line.StartsWith("flags", StringComparison.Ordinal)) continue;
            var colon = line.IndexOf(':');
            if (colon < 0) return false;
            var have = line.Substring(colon + 1).Split([' ', '\t'], StringSplitOptions.RemoveEmptyEntries);
            foreach (var flag in CpuFlags)
                if (Array.IndexOf(have, flag) < 0) return false;
            return true; // the first processor's flags; the kernel reports the same set for every core
        }
        return false;
    }
#endif

    // glibc names its version; musl and others have no gnu_get_libc_version (EntryPointNotFoundException: no).
    private static bool GlibcAtLeast(Version needed)
    {
        var text = Marshal.PtrToStringAnsi(gnu_get_libc_version());
        return text is not null && Version.Parse(text) >= needed;
    }

    // The shared libraries it links besides glibc's own (ldd of the packed executable): zlib. Checked because a
    // missing one would stop the executable after the process was already handed over. dlopen is in libc from
    // glibc 2.34 on, which GlibcAtLeast has checked.
    private static bool LibrariesLoad()
    {
        var name = CString("libz.so.1");
        try { return dlopen(name, LazyBinding) != IntPtr.Zero; }
        finally { Marshal.FreeHGlobal(name); }
    }

    private static bool Executable(string path)
    {
        var name = CString(path);
        try { return access(name, ExecuteOk) == 0; }
        finally { Marshal.FreeHGlobal(name); }
    }

    /// <summary>
    /// <paramref name="text"/> as a NUL-terminated UTF-8 string in unmanaged memory (free with
    /// <see cref="Marshal.FreeHGlobal"/>). The native calls here take only such pointers and integers, so the runtime
    /// calls them without generating marshalling code first.
    /// </summary>
    public static IntPtr CString(string text)
    {
        var bytes = Encoding.UTF8.GetBytes(text + "\0");
        var memory = Marshal.AllocHGlobal(bytes.Length);
        Marshal.Copy(bytes, 0, memory, bytes.Length);
        return memory;
    }

    private const int ExecuteOk = 1; // X_OK
    private const int LazyBinding = 1; // RTLD_LAZY

    [DllImport("libc", EntryPoint = "dlopen")]
    private static extern IntPtr dlopen(IntPtr file, int mode);

    [DllImport("libc", EntryPoint = "access")]
    private static extern int access(IntPtr path, int mode);

    [DllImport("libc", EntryPoint = "gnu_get_libc_version")]
    private static extern IntPtr gnu_get_libc_version();
}
