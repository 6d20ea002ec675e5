using System.Linq;
using System.Reflection;

namespace GateTasks.MSBuild;

/// <summary>
/// The help link MSBuild shows beside a GateTasks error or warning: the code's entry in docs/error-codes.md, whose rows
/// carry an anchor named after the lower-cased code (<c>#gate0011</c>). The page's address is the repository's
/// (GateTasksRepositoryUrl in Directory.Build.props), compiled into this assembly as metadata.
/// </summary>
internal static class ErrorCodeHelpLink
{
    /// <summary>Assembly metadata key holding the address of docs/error-codes.md.</summary>
    internal const string MetadataKey = "GateTasksErrorCodesUrl";

    private static readonly string? Page = typeof(ErrorCodeHelpLink).Assembly
        .GetCustomAttributes<AssemblyMetadataAttribute>()
        .FirstOrDefault(a => a.Key == MetadataKey)?.Value;

    /// <summary>The link for a code; null when there is no code or the assembly was built without the address.</summary>
    internal static string? For(string? code) =>
        string.IsNullOrEmpty(code) || string.IsNullOrEmpty(Page) ? null : Page + "#" + code!.ToLowerInvariant();
}
