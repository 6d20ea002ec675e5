namespace GateTasks.Engine.Contracts;

/// <summary>The JSON Schema of contract version 1, embedded from docs/precision-contract.schema.json.</summary>
internal static class ContractSchema
{
    public static string Text { get; } = Load();

    private static string Load()
    {
        using var stream = typeof(ContractSchema).Assembly.GetManifestResourceStream("GateTasks.Engine.precision-contract.schema.json")
            ?? throw new InvalidOperationException("The contract schema resource is missing from the engine assembly.");
        using var reader = new StreamReader(stream);
        return reader.ReadToEnd();
    }
}
