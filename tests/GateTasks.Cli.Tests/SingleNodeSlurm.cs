using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using System.Text;
using System.Text.RegularExpressions;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A Slurm cluster of one node on this machine, for tests: its own munge key and munged, its own slurm.conf, ports,
/// state, spool and logs, all under one folder. The daemons run in the foreground as children of the test, so they are
/// stopped by their process ids (never by name) when it is disposed, whatever the test did; a system munge or Slurm is
/// left alone. Client commands find the cluster through <see cref="Environment"/> (SLURM_CONF).
/// The slurm.conf keys and daemon options used here are those of Slurm 22.05 as Debian installs it (man slurm.conf,
/// man slurmctld, man slurmd, man sbatch of slurm-wlm 22.05.8) and of munge 0.5.15 (man munged).
/// </summary>
public sealed partial class SingleNodeSlurm : IDisposable
{
    /// <summary>The programs the cluster needs: the daemons, the clients it and its users call, and munged.</summary>
    public static readonly IReadOnlyList<string> Programs = ["slurmctld", "slurmd", "sbatch", "sinfo", "squeue", "scancel", "munged", "mungekey"];

    private readonly string _root;
    private readonly List<(string Name, Process Process, StringBuilder Output)> _daemons = [];

    private SingleNodeSlurm(string root)
    {
        _root = root;
        ConfigPath = Path.Combine(root, "slurm.conf");
        Environment = new Dictionary<string, string> { ["SLURM_CONF"] = ConfigPath };
    }

    /// <summary>The cluster's slurm.conf.</summary>
    public string ConfigPath { get; }

    /// <summary>What a client command (sbatch, sinfo, …) needs in its environment to reach this cluster.</summary>
    public IReadOnlyDictionary<string, string> Environment { get; }

    /// <summary>The full path of a program found on PATH, or null.</summary>
    public static string? FindOnPath(string program) =>
        (System.Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator, StringSplitOptions.RemoveEmptyEntries)
        .Select(dir => Path.Combine(dir, program)).FirstOrDefault(File.Exists);

    /// <summary>
    /// Writes the configuration under <paramref name="root"/>, starts munged, slurmctld and slurmd and waits until the
    /// node is idle. Throws, with the daemons' logs, when one does not start; whatever did start is stopped first.
    /// </summary>
    public static SingleNodeSlurm Start(string root, TimeSpan timeout)
    {
        var cluster = new SingleNodeSlurm(root);
        try
        {
            cluster.Configure();
            cluster.StartDaemons(timeout);
            return cluster;
        }
        catch (Exception e)
        {
            var logs = cluster.Logs();
            cluster.Dispose();
            throw new InvalidOperationException($"single-node Slurm did not start: {e.Message}\n{logs}", e);
        }
    }

    /// <summary>Runs a Slurm client command against this cluster.</summary>
    public (int ExitCode, string Stdout, string Stderr) Client(string program, params string[] args) =>
        ProcessRunner.Run(Program(program), args, _root, Environment, timeoutSeconds: 30);

    private void Configure()
    {
        if (!OperatingSystem.IsLinux()) throw new PlatformNotSupportedException("a single-node Slurm needs Linux");
        foreach (var dir in new[] { "munge", "state", "spool", "log" }) Directory.CreateDirectory(Path.Combine(_root, dir));
        // A key of the cluster's own, made by munge's mungekey (readable by its owner only), in a folder only root may enter.
        File.SetUnixFileMode(Path.Combine(_root, "munge"), UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute);
        var key = Path.Combine(_root, "munge", "munge.key");
        var made = ProcessRunner.Run(Program("mungekey"), ["--create", $"--keyfile={key}"], _root, timeoutSeconds: 30);
        if (made.ExitCode != 0) throw new InvalidOperationException($"mungekey --create gave exit {made.ExitCode}: {made.Stdout}{made.Stderr}");

        // `slurmd -C` prints this machine's node line (name, CPUs, sockets, cores, threads, memory) as slurmd will
        // find them, so the node is not drained for a mismatch.
        var (code, stdout, stderr) = ProcessRunner.Run(Program("slurmd"), ["-C"], _root, timeoutSeconds: 30);
        var nodeLine = stdout.Split('\n').FirstOrDefault(l => l.StartsWith("NodeName=", StringComparison.Ordinal));
        if (code != 0 || nodeLine is null) throw new InvalidOperationException($"slurmd -C gave no node line (exit {code}): {stdout}{stderr}");
        var host = NodeName().Match(nodeLine).Groups[1].Value;
        var (controllerPort, nodePort) = (FreePort(), FreePort());
        while (nodePort == controllerPort) nodePort = FreePort();

        string P(params string[] parts) => Path.Combine([_root, .. parts]);
        File.WriteAllText(ConfigPath, $"""
            ClusterName=gatetasks-test
            SlurmctldHost={host}(127.0.0.1)
            SlurmctldPort={controllerPort}
            SlurmdPort={nodePort}
            AuthType=auth/munge
            CredType=cred/munge
            AuthInfo=socket={P("munge", "socket")}
            SlurmUser=root
            SlurmdUser=root
            StateSaveLocation={P("state")}
            SlurmdSpoolDir={P("spool")}
            SlurmctldPidFile={P("slurmctld.pid")}
            SlurmdPidFile={P("slurmd.pid")}
            SlurmctldLogFile={P("log", "slurmctld.log")}
            SlurmdLogFile={P("log", "slurmd.log")}
            ProctrackType=proctrack/linuxproc
            TaskPlugin=task/none
            JobAcctGatherType=jobacct_gather/none
            AccountingStorageType=accounting_storage/none
            MailProg=/bin/true
            MpiDefault=none
            ReturnToService=2
            SchedulerParameters=batch_sched_delay=0
            DependencyParameters=kill_invalid_depend
            {nodeLine} NodeAddr=127.0.0.1 State=UNKNOWN
            PartitionName=test Nodes=ALL Default=YES MaxTime=INFINITE State=UP

            """);
        // batch_sched_delay=0: a job whose dependency is met starts within a second, not after the default 3 s (man slurm.conf).
        // kill_invalid_depend: a job whose dependency can no longer be met is cancelled (man slurm.conf), so `sbatch --wait` returns.
    }

    private void StartDaemons(TimeSpan timeout)
    {
        var deadline = DateTime.UtcNow + timeout;
        var socket = Path.Combine(_root, "munge", "socket");
        // --force: start although the folders are not those munged expects (its checks are for a system install).
        StartDaemon("munged", "--foreground", "--force", $"--socket={socket}", $"--key-file={Path.Combine(_root, "munge", "munge.key")}",
            $"--pid-file={Path.Combine(_root, "munge", "munged.pid")}", $"--log-file={Path.Combine(_root, "log", "munged.log")}",
            $"--seed-file={Path.Combine(_root, "munge", "seed")}");
        WaitFor(() => File.Exists(socket), deadline, "munged's socket");
        // -D: stay in the foreground (a child of the test); -i: ignore saved state (there is none).
        StartDaemon("slurmctld", "-D", "-i");
        StartDaemon("slurmd", "-D");
        WaitFor(() => Client("sinfo", "-h", "-o", "%T").Stdout.Trim() == "idle", deadline, "the node to be idle (sinfo)");
    }

    private void StartDaemon(string program, params string[] args)
    {
        var psi = new ProcessStartInfo(Program(program)) { WorkingDirectory = _root, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in args) psi.ArgumentList.Add(a);
        foreach (var (k, v) in Environment) psi.Environment[k] = v;
        var output = new StringBuilder();
        var process = new Process { StartInfo = psi };
        process.OutputDataReceived += (_, e) => { lock (output) output.AppendLine(e.Data); };
        process.ErrorDataReceived += (_, e) => { lock (output) output.AppendLine(e.Data); };
        process.Start();
        _daemons.Add((program, process, output));
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
    }

    private void WaitFor(Func<bool> condition, DateTime deadline, string what)
    {
        while (!condition())
        {
            foreach (var (name, process, _) in _daemons)
                if (process.HasExited) throw new InvalidOperationException($"{name} exited with code {process.ExitCode} while waiting for {what}");
            if (DateTime.UtcNow > deadline) throw new TimeoutException($"timed out waiting for {what}");
            Thread.Sleep(200);
        }
    }

    /// <summary>The daemons' log files and console output, for a failure message.</summary>
    public string Logs()
    {
        var text = new StringBuilder();
        var logDir = Path.Combine(_root, "log");
        if (Directory.Exists(logDir))
            foreach (var log in Directory.GetFiles(logDir).Order())
                text.Append($"--- {Path.GetFileName(log)} (last 40 lines)\n").AppendJoin('\n', File.ReadAllLines(log).TakeLast(40)).Append('\n');
        foreach (var (name, _, output) in _daemons)
            lock (output) text.Append($"--- {name} console\n").Append(output.ToString().Trim()).Append('\n');
        return text.ToString();
    }

    /// <summary>Cancels the cluster's jobs, then stops slurmd, slurmctld and munged by process id (TERM, then KILL).</summary>
    public void Dispose()
    {
        if (_daemons.Any(d => d.Name == "slurmctld" && !d.Process.HasExited))
        {
            try
            {
                Client("scancel", "--user=root");
                var until = DateTime.UtcNow.AddSeconds(15);
                while (DateTime.UtcNow < until && Client("squeue", "-h").Stdout.Trim().Length > 0) Thread.Sleep(200);
            }
            catch (TimeoutException) { }
        }
        foreach (var (_, process, _) in Enumerable.Reverse(_daemons))
        {
            try
            {
                if (!process.HasExited)
                {
                    using (var kill = Process.Start("kill", ["-TERM", process.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)])) kill.WaitForExit();
                    if (!process.WaitForExit(10_000)) process.Kill(entireProcessTree: true);
                }
                process.WaitForExit();
            }
            catch (InvalidOperationException) { }
            process.Dispose();
        }
        _daemons.Clear();
    }

    private static string Program(string name) => FindOnPath(name) ?? throw new InvalidOperationException($"{name} is not on PATH (apt-get install slurm-wlm munge)");

    private static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }

    [GeneratedRegex(@"^NodeName=(\S+)")]
    private static partial Regex NodeName();
}
