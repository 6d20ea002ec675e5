using GateTasks.Engine.Contracts;
using GateTasks.Engine.IO;

namespace GateTasks.Cli.Commands;

/// <summary>
/// The files one command reads, keeps and writes, checked before it does any work: no output may name an input, a
/// file of the contract, or another output (GATE0004), or be anything but a regular file or a new path (GATE0005); no
/// input may be a pipe, a device or a socket (GATE0006).
/// </summary>
internal sealed class RunPaths
{
    private readonly List<RunFile> _reads = [];
    private readonly List<RunFile> _kept = [];
    private readonly List<RunFile> _writes = [];

    /// <summary>A file the command reads.</summary>
    public RunPaths Read(string path, string role)
    {
        _reads.Add(new RunFile(path, role));
        return this;
    }

    /// <summary>Files the command reads, each called <paramref name="role"/>.</summary>
    public RunPaths Read(IEnumerable<string> paths, string role)
    {
        foreach (var path in paths) Read(path, role);
        return this;
    }

    /// <summary>A file the command does not read but must never overwrite (the contract's ledger, say).</summary>
    public RunPaths Keep(string path, string role)
    {
        _kept.Add(new RunFile(path, role));
        return this;
    }

    /// <summary>
    /// The contract's own files: the contract and its reference are read; the acceptance ledger is read when
    /// <paramref name="readsLedger"/>, else kept from harm.
    /// </summary>
    public RunPaths Contract(PrecisionContract contract, bool readsLedger = false)
    {
        Read(contract.FilePath, "the contract");
        Read(contract.ReferenceFullPath, "the contract's reference");
        return readsLedger ? Read(contract.LedgerFullPath, "the contract's acceptance ledger") : Keep(contract.LedgerFullPath, "the contract's acceptance ledger");
    }

    /// <summary>A file the command writes, named by <paramref name="role"/> (its option); null: not requested.</summary>
    public RunPaths Write(string? path, string role)
    {
        if (path is not null) _writes.Add(new RunFile(path, role));
        return this;
    }

    /// <summary>GATE0005 or GATE0004 for an output that would destroy something; nothing has been written yet.</summary>
    public RunPaths VerifyOutputs()
    {
        OutputPathGuard.Verify(_writes, _reads.Concat(_kept));
        return this;
    }

    /// <summary>
    /// Whether <paramref name="path"/>, written alone, would destroy nothing: a regular file or a new path that names no
    /// input or kept file. After an output was refused, the other requested reports that pass this lose their earlier
    /// verdict all the same.
    /// </summary>
    public bool CanWriteAlone(string? path)
    {
        if (path is null) return false;
        try
        {
            OutputPathGuard.Verify([new RunFile(path, "the report")], _reads.Concat(_kept));
            return true;
        }
        catch (Engine.Diagnostics.GateInputException)
        {
            return false;
        }
    }

    /// <summary>GATE0006 for an input that is not a regular file; nothing has been opened yet.</summary>
    public RunPaths VerifyInputs()
    {
        InputFileGuard.VerifyAll(_reads);
        return this;
    }

    /// <summary>Both checks, outputs first.</summary>
    public void Verify() => VerifyOutputs().VerifyInputs();
}
