namespace GateTasks.Engine.IO;

/// <summary>A file one run reads or writes, and what messages call it (<c>--junit</c>, <c>the contract</c> …).</summary>
internal readonly record struct RunFile(string Path, string Role);
