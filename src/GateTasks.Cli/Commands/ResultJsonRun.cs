using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Reports;

namespace GateTasks.Cli.Commands;

/// <summary>
/// Runs a command that may write a JSON result (<c>accept</c>, <c>plan</c>, <c>rank</c>) with the protections
/// <c>check</c> gives its reports: a <c>--json</c> path that names an input or another output is refused and left
/// untouched (GATE0004/GATE0005); otherwise the earlier document is removed before any work and replaced by one saying
/// the run is under way, which a killed run leaves; a run that stops on an error leaves a document saying so with the
/// error's code. Only <see cref="Finished"/> marks the command's own document as in place.
/// </summary>
internal sealed class ResultJsonRun
{
    private readonly UnfinishedReport.Paths _paths;
    private readonly string _contractPath;
    private readonly DateTimeOffset _started = DateTimeOffset.UtcNow;
    private bool _finished;

    private ResultJsonRun(string? json, string command, string contractPath)
    {
        _paths = new UnfinishedReport.Paths(null, null, null, null, json, command);
        _contractPath = contractPath;
    }

    /// <summary>The JSON path requested, or null.</summary>
    public string? Path => _paths.Json;

    /// <summary>Says the command's own document has been written: an error after this leaves it as it is.</summary>
    public void Finished() => _finished = true;

    /// <summary>
    /// Loads the contract, checks the paths <paramref name="files"/> lists (with <c>--json</c> among the outputs),
    /// marks the JSON as under way, then runs <paramref name="body"/>.
    /// </summary>
    public static int Run(string? json, string command, string contractPath, Func<PrecisionContract, RunPaths> files, Func<PrecisionContract, ResultJsonRun, int> body)
    {
        var run = new ResultJsonRun(json, command, contractPath);
        PrecisionContract loaded;
        try
        {
            loaded = ContractLoader.Load(contractPath);
        }
        catch (GateInputException e)
        {
            // The contract's own ledger is unknown; at least the default one is never overwritten.
            var guard = new RunPaths().Read(contractPath, "the contract").Keep(
                System.IO.Path.Combine(System.IO.Path.GetDirectoryName(System.IO.Path.GetFullPath(contractPath))!, AcceptanceSettings.DefaultLedgerName(contractPath)),
                "the contract's acceptance ledger");
            if (guard.CanWriteAlone(json)) run.Stop(e);
            throw;
        }
        RunPaths? listed = null;
        try
        {
            listed = files(loaded).Write(json, "--json");
            listed.VerifyOutputs();
        }
        catch (GateInputException e)
        {
            // Another output was refused, or an input could not be found: the JSON, if it may be written, still loses its earlier result.
            if ((listed ?? new RunPaths().Contract(loaded)).CanWriteAlone(json)) run.Stop(e);
            throw;
        }
        var paths = listed;
        try
        {
            UnfinishedReport.Clear(run._paths);
            UnfinishedReport.MarkRunning(run._paths, contractPath, run._started);
            paths.VerifyInputs();
            return body(loaded, run);
        }
        catch (GateInputException e)
        {
            if (!run._finished) UnfinishedReport.MarkFailed(run._paths, contractPath, run._started, e);
            throw;
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            if (!run._finished)
                UnfinishedReport.MarkStopped(run._paths, contractPath, run._started, ErrorCodes.CheckUnfinished,
                    $"the {command} stopped on an internal error ({e.GetType().Name}: {e.Message})", null);
            throw;
        }
    }

    private void Stop(GateInputException e)
    {
        if (_paths.Json is null) return;
        UnfinishedReport.Clear(_paths);
        UnfinishedReport.MarkFailed(_paths, _contractPath, _started, e);
    }
}
