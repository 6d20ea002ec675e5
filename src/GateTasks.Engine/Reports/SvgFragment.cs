namespace GateTasks.Engine.Reports;

/// <summary>
/// OxyPlot's SVG export made fit for a page that holds many plots. The exporter writes an XML declaration even when
/// asked for a fragment, and numbers its clip paths from 1 in every export; a page resolves <c>url(#id)</c> to the
/// first element of that id anywhere in it, so without a prefix of its own every plot would be clipped to the first
/// plot's area.
/// </summary>
internal static class SvgFragment
{
    /// <summary>The export from its <c>&lt;svg</c> element on, with its clip-path ids prefixed by <paramref name="idPrefix"/>.</summary>
    public static string Scoped(string exported, string idPrefix)
    {
        var start = exported.IndexOf("<svg", StringComparison.Ordinal);
        return exported[Math.Max(0, start)..]
            .Replace("id=\"clipPath", $"id=\"{idPrefix}-clipPath", StringComparison.Ordinal)
            .Replace("url(#clipPath", $"url(#{idPrefix}-clipPath", StringComparison.Ordinal);
    }
}
