namespace GateTasks.Engine.Samples;

/// <summary>
/// One file of a sample and the XXH128 digest of its bytes. The digest, not the name, says which shard a file is:
/// a copy under another name, or behind a link, has the same digest.
/// </summary>
internal sealed record ShardFile(string Path, string Xxh128);
