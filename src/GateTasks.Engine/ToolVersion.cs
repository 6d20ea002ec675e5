using System.Reflection;

namespace GateTasks.Engine;

/// <summary>The engine's informational version, recorded in references and reports.</summary>
internal static class ToolVersion
{
    public static string Current { get; } =
        typeof(ToolVersion).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion.Split('+')[0] ?? "0.0.0";
}
