using GateTasks.Engine.Diagnostics;
using YamlDotNet.Core;
using YamlDotNet.Core.Events;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads a contract's YAML as a flat stream of events (YamlDotNet's parser does not recurse) before it is loaded
/// into nodes (which does): nesting deeper than any contract needs would overflow the stack and kill the process,
/// and aliases of aliases can make a small file stand for an enormous tree (an "alias bomb"). Both are refused as
/// GATE1002 where they start.
/// </summary>
internal static class YamlShapeGuard
{
    /// <summary>Far deeper than a contract's own structure (about six levels).</summary>
    public const int MaxDepth = 64;

    /// <summary>Nodes the document may stand for with every alias expanded: far more than any contract holds.</summary>
    public const long MaxExpandedNodes = 100_000;

    public static void Verify(string text, string path)
    {
        var parser = new Parser(new StringReader(text));
        // Per open collection: its anchor and the nodes it holds so far, aliases counted at their expanded size.
        var open = new Stack<(string? Anchor, long Nodes)>();
        open.Push((null, 0));
        var sizes = new Dictionary<string, long>(StringComparer.Ordinal);
        var anchors = new HashSet<string>(StringComparer.Ordinal);
        var lastRead = Mark.Empty;
        try
        {
            while (parser.MoveNext())
            {
                var current = parser.Current!;
                lastRead = current.End;
                switch (current)
                {
                    case NodeEvent { } collection and (MappingStart or SequenceStart):
                        if (!collection.Anchor.IsEmpty) anchors.Add(collection.Anchor.Value);
                        if (open.Count > MaxDepth)
                            throw Refuse(path, current.Start, $"The contract nests more than {MaxDepth} levels deep here; no contract needs that.");
                        open.Push((collection.Anchor.IsEmpty ? null : collection.Anchor.Value, 1));
                        break;
                    case MappingEnd or SequenceEnd:
                        var (anchor, nodes) = open.Pop();
                        if (anchor is not null) sizes[anchor] = nodes;
                        Add(open, nodes, path, current.Start);
                        break;
                    case Scalar scalar:
                        if (!scalar.Anchor.IsEmpty)
                        {
                            sizes[scalar.Anchor.Value] = 1;
                            anchors.Add(scalar.Anchor.Value);
                        }
                        Add(open, 1, path, current.Start);
                        break;
                    case AnchorAlias alias:
                        // YamlDotNet reports an undefined alias without a position: said here, where the alias stands.
                        if (!anchors.Contains(alias.Value.Value))
                            throw Refuse(path, current.Start,
                                $"Not valid YAML: the alias '*{alias.Value.Value}' refers to no anchor ('&{alias.Value.Value}') defined before it.");
                        Add(open, sizes.GetValueOrDefault(alias.Value.Value, 1), path, current.Start);
                        break;
                }
            }
        }
        catch (YamlException e) when (e.Start.Index == 0 && e.End.Index == 0 || e.Message.Contains("tab", StringComparison.OrdinalIgnoreCase))
        {
            // YamlDotNet raises some scanner errors without a position, and places a tab that breaks indentation at the
            // scalar before it: find the tab itself.
            var from = e.Start.Index == 0 && e.End.Index == 0 ? lastRead : e.Start;
            var tab = TabIndentation(text, (int)from.Line);
            throw Refuse(path, tab ?? from,
                $"Not valid YAML: {(e.InnerException ?? e).Message}{(tab is null ? "" : " A tab indents this line; YAML indents with spaces only.")}");
        }
        catch (YamlException)
        {
            // Not valid YAML: the loading that follows reports it, with the same words as for any other contract.
        }
        catch (InvalidOperationException)
        {
            // YamlDotNet's scanner gives up this way on some malformed text (found by fuzzing): still bad YAML, here.
            throw Refuse(path, lastRead, "Not valid YAML: the text after this point cannot be read.");
        }
    }

    /// <summary>The first tab in a line's indentation, from line <paramref name="fromLine"/> on (1-based), or null.</summary>
    private static Mark? TabIndentation(string text, int fromLine)
    {
        var lines = text.Split('\n');
        for (var i = Math.Max(0, fromLine - 1); i < lines.Length; i++)
        {
            var line = lines[i];
            for (var c = 0; c < line.Length && line[c] is ' ' or '\t'; c++)
                if (line[c] == '\t') return new Mark(1, i + 1, c + 1);
        }
        return null;
    }

    private static void Add(Stack<(string? Anchor, long Nodes)> open, long nodes, string path, Mark at)
    {
        var (anchor, count) = open.Pop();
        count = Math.Min(count + nodes, MaxExpandedNodes + 1);
        if (count > MaxExpandedNodes)
            throw Refuse(path, at, $"With its aliases expanded the contract would stand for more than {MaxExpandedNodes} values (an alias of aliases here); write the values out.");
        open.Push((anchor, count));
    }

    private static GateInputException Refuse(string path, Mark at, string message) =>
        new(ErrorCodes.ContractSyntax, message, new SourceLocation(path, (int)at.Line, (int)at.Column));
}
