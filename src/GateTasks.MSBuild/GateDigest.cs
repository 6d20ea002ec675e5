using System;
using System.IO;
using System.Linq;
using Microsoft.Build.Framework;
using Microsoft.Build.Utilities;

namespace GateTasks.MSBuild;

/// <summary>
/// The content digest a passing check is recorded under: every input file (contracts, references, ledgers, sample
/// files), the engine's files, the targets and the settings. A later build skips the check only when the digest is
/// the same, whatever the files' modification times say.
/// </summary>
public sealed class GateDigest : Task
{
    /// <summary>The files to digest, in order (their paths count too).</summary>
    [Required]
    public ITaskItem[] Files { get; set; } = [];

    /// <summary>The engine's folder: every file in it is digested, so a changed engine reruns the check.</summary>
    public string? EngineDirectory { get; set; }

    /// <summary>The digest, 32 hexadecimal digits.</summary>
    [Output]
    public string Digest { get; private set; } = "";

    /// <inheritdoc />
    public override bool Execute()
    {
        try
        {
            var digest = new InputsDigest().Add("gatetasks-digest 1");
            digest.AddPaths(Files.Select(f => f.GetMetadata("FullPath")));
            if (!string.IsNullOrEmpty(EngineDirectory)) digest.AddFolderFiles(EngineDirectory!);
            Digest = digest.Hex();
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // An unreadable input: no digest, so the check runs and says what is wrong with it.
            Log.LogMessage(MessageImportance.Low, "GateTasks: cannot digest the inputs ({0}); the check runs.", e.Message);
            Digest = "";
        }
        return true;
    }
}
