using System.Diagnostics;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A fact that needs what only root may do here: mount a small tmpfs (a disk that can be filled for real) or make a
/// device node in a temporary folder. Skipped with a message where the system does not permit it; the probe makes and
/// removes its own tmpfs or node in a fresh temporary folder, never touching anything else.
/// </summary>
public sealed class PrivilegedFactAttribute : FactAttribute
{
    public PrivilegedFactAttribute(string needs)
    {
        var ok = needs switch
        {
            "tmpfs" => Privileged.CanMountTmpfs.Value,
            "mknod" => Privileged.CanMakeDevice.Value,
            _ => throw new ArgumentException(needs),
        };
        if (!ok) Skip = $"needs permission to {(needs == "tmpfs" ? "mount a tmpfs (mount -t tmpfs, as root)" : "make a device node (mknod, as root)")}, not granted here";
    }
}

/// <summary>Mounting a small tmpfs and making a device node, in temporary folders only.</summary>
public static class Privileged
{
    public static readonly Lazy<bool> CanMountTmpfs = new(() =>
    {
        if (!OperatingSystem.IsLinux()) return false;
        var dir = Directory.CreateTempSubdirectory("gatetasks-probe-").FullName;
        try
        {
            if (Command("mount", "-t", "tmpfs", "-o", "size=16k", "tmpfs", dir) != 0) return false;
            Command("umount", dir);
            return true;
        }
        finally
        {
            try { Directory.Delete(dir); } catch (IOException) { }
        }
    });

    public static readonly Lazy<bool> CanMakeDevice = new(() =>
    {
        if (!OperatingSystem.IsLinux()) return false;
        var dir = Directory.CreateTempSubdirectory("gatetasks-probe-").FullName;
        try
        {
            return MakeNullDevice(Path.Combine(dir, "null"));
        }
        finally
        {
            try { Directory.Delete(dir, recursive: true); } catch (IOException) { }
        }
    });

    /// <summary>Mounts a tmpfs of <paramref name="size"/> (e.g. "64k") on <paramref name="dir"/>.</summary>
    public static void MountTmpfs(string dir, string size) =>
        Assert.Equal(0, Command("mount", "-t", "tmpfs", "-o", $"size={size}", "tmpfs", dir));

    public static void Unmount(string dir) => Command("umount", dir);

    /// <summary>
    /// Makes at <paramref name="path"/> a character device with the numbers of the null device (1, 3): a node of our
    /// own, so whatever a faulty program does to it, the machine's /dev/null is not touched.
    /// </summary>
    public static bool MakeNullDevice(string path) => Command("mknod", path, "c", "1", "3") == 0;

    /// <summary>The kind of file at <paramref name="path"/> as GNU stat says it ("fifo", "regular file" …), links not followed.</summary>
    public static string KindOf(string path)
    {
        var psi = new ProcessStartInfo("stat", ["-c", "%F", path]) { RedirectStandardOutput = true, RedirectStandardError = true };
        using var p = Process.Start(psi)!;
        var output = p.StandardOutput.ReadToEnd().Trim();
        p.WaitForExit();
        return output;
    }

    private static int Command(string file, params string[] args)
    {
        try
        {
            var psi = new ProcessStartInfo(file, args) { RedirectStandardOutput = true, RedirectStandardError = true };
            using var p = Process.Start(psi)!;
            p.StandardOutput.ReadToEnd();
            p.StandardError.ReadToEnd();
            p.WaitForExit();
            return p.ExitCode;
        }
        catch (System.ComponentModel.Win32Exception)
        {
            return -1;
        }
    }
}
