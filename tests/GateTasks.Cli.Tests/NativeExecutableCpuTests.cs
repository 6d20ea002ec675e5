using GateTasks.Cli;

namespace GateTasks.Cli.Tests;

public class NativeExecutableCpuTests
{
    [X86LinuxFact]
    public void The_movbe_and_f16c_bits_read_by_cpuid_agree_with_the_kernels_cpu_flags()
    {
        // Independent source: the Linux kernel's /proc/cpuinfo "flags" line, which names CPUID leaf 1 ECX bit 22 as
        // "movbe" and bit 29 as "f16c" (arch/x86/include/asm/cpufeatures.h; bit positions from memory of the Intel
        // SDM vol. 2A CPUID table).
        var flags = File.ReadLines("/proc/cpuinfo").First(l => l.StartsWith("flags", StringComparison.Ordinal));
        var have = flags[(flags.IndexOf(':') + 1)..].Split([' ', '\t'], StringSplitOptions.RemoveEmptyEntries);
        var kernelSays = have.Contains("movbe") && have.Contains("f16c");

        Assert.Equal(kernelSays, NativeExecutable.CpuHasMovbeAndF16c());
    }
}

/// <summary>A fact about x86 CPUs as Linux reports them: skipped elsewhere (CI runs on x86-64 Linux).</summary>
public sealed class X86LinuxFactAttribute : FactAttribute
{
    public X86LinuxFactAttribute()
    {
        if (!OperatingSystem.IsLinux() || !System.Runtime.Intrinsics.X86.X86Base.IsSupported || !File.Exists("/proc/cpuinfo"))
            Skip = "needs Linux on an x86 CPU (/proc/cpuinfo and CPUID)";
    }
}
