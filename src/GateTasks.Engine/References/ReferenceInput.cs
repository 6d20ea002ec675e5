namespace GateTasks.Engine.References;

/// <summary>A file a reference was built from, identified by its SHA-256.</summary>
internal sealed record ReferenceInput(string Path, long Bytes, string Sha256);
