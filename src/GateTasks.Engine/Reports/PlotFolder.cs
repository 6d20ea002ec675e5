using System.Globalization;
using System.Net;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The plots of a run as standalone SVG files in one folder (<c>check --plots DIR</c>): one per feature (the HTML
/// report's plot) and one per declared pair (its 2-D map, or a one-line note when the reference holds no cells for
/// it). File names come from the contract alone, so they are known — and checked against the run's inputs — before
/// the sample is read; each file is written atomically.
/// </summary>
internal static class PlotFolder
{
    /// <summary>One planned file: the feature or pair it shows and its file name inside the folder.</summary>
    public sealed record PlannedPlot(string Subject, bool IsPair, string FileName);

    private const int MaxStem = 100;

    /// <summary>
    /// Every file of the contract's plots: features first, then pairs (<c>first-vs-second</c>), in contract order. A
    /// name keeps ASCII letters, digits, '.', '_' and '-' and turns every other character into '_'; a name that would
    /// start with '.' or '-', or is a name Windows reserves for a device, is prefixed with '_'; names that differ only
    /// in case (the same file on a case-insensitive file system) get "-2", "-3", … in contract order.
    /// </summary>
    public static IReadOnlyList<PlannedPlot> Plan(PrecisionContract contract)
    {
        var used = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        var plans = new List<PlannedPlot>();
        foreach (var f in contract.Features) plans.Add(new PlannedPlot(f.Name, false, Unique(Stem(f.Name), used)));
        foreach (var p in contract.Pairs) plans.Add(new PlannedPlot(p.Name, true, Unique(Stem(p.First) + "-vs-" + Stem(p.Second), used)));
        return plans;
    }

    /// <summary>GATE0018 unless <paramref name="folder"/> is a folder (or a link to one) or a new path.</summary>
    public static void VerifyFolder(string folder)
    {
        var node = FileNode.Of(folder);
        if (node.Kind is FileNodeKind.Missing or FileNodeKind.Directory) return;
        var full = Path.GetFullPath(folder);
        throw new GateInputException(ErrorCodes.PlotsNotFolder,
            $"--plots '{full}' is {FileNode.Describe(node.Kind)}, not a folder; --plots takes a folder (an existing one or a new path) to write one SVG file per plot into. Nothing was written.",
            new SourceLocation(full));
    }

    /// <summary>GATE0018 unless <paramref name="folder"/> is a folder or a new path; creates it if new (GATE0019 when it cannot be).</summary>
    public static void Create(string folder)
    {
        VerifyFolder(folder);
        var full = Path.GetFullPath(folder);
        try
        {
            Directory.CreateDirectory(full);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new GateInputException(ErrorCodes.PlotsFolderNotCreated, $"Cannot create the plots folder '{full}': {e.Message}", new SourceLocation(full));
        }
    }

    /// <summary>Creates the folder if needed (<see cref="Create"/>) and writes every planned plot; returns the files written.</summary>
    public static IReadOnlyList<string> Write(RunResult report, string folder)
    {
        Create(folder);
        var full = Path.GetFullPath(folder);
        var written = new List<string>();
        var comparisons = report.Comparisons.ToDictionary(c => c.Spec.Name, StringComparer.Ordinal);
        var pairs = report.Contract.Pairs.ToDictionary(p => p.Name, StringComparer.Ordinal);
        foreach (var plan in Plan(report.Contract))
        {
            var path = Path.Combine(full, plan.FileName);
            string? svg = null;
            if (plan.IsPair)
            {
                var spec = pairs[plan.Subject];
                svg = PairMap.Of(report, spec) is { } map ? PairMapPlot.Document(map) : NoteDocument(PairMap.MissingNote(spec));
            }
            else if (comparisons.TryGetValue(plan.Subject, out var c))
            {
                var outcomes = report.Outcomes.Where(o => o.Subject.Name == plan.Subject).ToList();
                // The fragment has no declaration (SvgFragment); the file gets one, ours.
                svg = Declaration + FeaturePlot.Svg(c, ComparedBin.Of(c), ToleranceBand.For(c, outcomes), "plot") + "\n";
            }
            if (svg is null) continue;
            AtomicFile.WriteText(path, svg);
            written.Add(path);
        }
        return written;
    }

    /// <summary>The planned files' full paths inside <paramref name="folder"/>.</summary>
    public static IEnumerable<string> Paths(PrecisionContract contract, string folder) =>
        Plan(contract).Select(p => Path.Combine(Path.GetFullPath(folder), p.FileName));

    private const string Declaration = "<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"no\"?>\n";

    private static string NoteDocument(string note) => Declaration + string.Create(CultureInfo.InvariantCulture,
        $"<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{PairMapPlot.Width}\" height=\"40\" viewBox=\"0 0 {PairMapPlot.Width} 40\">" +
        $"<text x=\"8\" y=\"24\" font-family=\"Arial, sans-serif\" font-size=\"13\" fill=\"{ReportPalette.Muted}\">{WebUtility.HtmlEncode(note)}</text></svg>\n");

    private static string Stem(string name)
    {
        var chars = name.Select(ch => char.IsAsciiLetterOrDigit(ch) || ch is '.' or '_' or '-' ? ch : '_').ToArray();
        var stem = new string(chars);
        if (stem.Length > MaxStem) stem = stem[..MaxStem];
        if (stem.Length == 0 || stem[0] is '.' or '-' || Reserved.Contains(stem.Split('.')[0])) stem = "_" + stem;
        return stem;
    }

    private static string Unique(string stem, HashSet<string> used)
    {
        var name = stem + ".svg";
        for (var n = 2; !used.Add(name); n++) name = $"{stem}-{n}.svg";
        return name;
    }

    // Device names Windows reserves in any folder, with any extension.
    private static readonly HashSet<string> Reserved = new(StringComparer.OrdinalIgnoreCase)
    {
        "CON", "PRN", "AUX", "NUL", "COM1", "COM2", "COM3", "COM4", "COM5", "COM6", "COM7", "COM8", "COM9",
        "LPT1", "LPT2", "LPT3", "LPT4", "LPT5", "LPT6", "LPT7", "LPT8", "LPT9",
    };
}
