namespace GateTasks.Engine.Diagnostics;

/// <summary>A place in an input file. Line and column are 1-based; 0 means "not known".</summary>
public sealed record SourceLocation(string File, int Line = 0, int Column = 0)
{
    /// <summary>Formats as <c>file(line,col)</c>, the shape compilers and MSBuild use.</summary>
    public override string ToString() => DiagnosticLine.Place(File, Line, Column);
}
