using System.Globalization;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;
using OxyPlot.Series;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The plot of one compared feature, drawn with OxyPlot and exported as SVG: an upper panel with the reference and
/// surrogate distributions as step lines (surrogate with ±1σ error bars), and a lower panel with the ratio
/// surrogate/reference ± its combined error over the tolerance bands of the feature's ratio-max checks.
/// </summary>
internal static class FeaturePlot
{
    public const double Width = 780;
    public const double Height = 430;
    private const string MainKey = "main";
    private const string RatioKey = "ratio";

    /// <summary>
    /// The plot as an SVG element (no XML declaration), ready to inline in HTML, its clip-path ids prefixed with
    /// <paramref name="idPrefix"/>, unique in the page (<see cref="SvgFragment"/>).
    /// </summary>
    public static string Svg(FeatureComparison comparison, IReadOnlyList<ComparedBin> bins, IReadOnlyList<ToleranceBand> bands, string idPrefix)
    {
        var model = Build(comparison, bins, bands);
        var exporter = new SvgExporter { Width = Width, Height = Height, IsDocument = false };
        return SvgFragment.Scoped(exporter.ExportToString(model), idPrefix);
    }

    private static PlotModel Build(FeatureComparison comparison, IReadOnlyList<ComparedBin> bins, IReadOnlyList<ToleranceBand> bands)
    {
        var discrete = comparison.Spec.Kind == FeatureKind.Discrete;
        var model = new PlotModel
        {
            // Helvetica's metrics measure the labels; Arial and Liberation Sans share them, so text fits where either is installed.
            DefaultFont = "Arial, 'Liberation Sans', Helvetica, sans-serif",
            DefaultFontSize = 13,
            TextColor = Color(ReportPalette.Ink),
            PlotAreaBorderThickness = new OxyThickness(0),
            Padding = new OxyThickness(6, 8, 14, 4),
            Background = Color(ReportPalette.Paper),
        };
        var edges = bins.Select(b => b.Lower).Append(bins[^1].Upper).ToList();
        var (viewLow, viewHigh) = View(edges, discrete);
        var pad = 0.01 * (viewHigh - viewLow);
        var x = PlotAxisStyle.Styled(new BinEdgeAxis(edges)
        {
            Position = AxisPosition.Bottom,
            Title = comparison.Spec.Name + (discrete ? " (one bin per value)" : ""),
            Minimum = viewLow - pad,
            Maximum = viewHigh + pad,
            MinorTickSize = 5,
            MajorTickSize = 8,
            AxisTitleDistance = 6,
        }, grid: false);
        if (discrete && bins.Count <= 30) x.MajorStep = 1;
        model.Axes.Add(x);
        model.Axes.Add(PlotAxisStyle.Styled(new LinearAxis
        {
            Key = MainKey,
            Position = AxisPosition.Left,
            StartPosition = 0.38,
            EndPosition = 1,
            Title = discrete ? "fraction of events" : "density (normalised)",
            AxisTitleDistance = 14,
            Minimum = 0,
            MaximumPadding = 0.18,
            StringFormat = "g3",
        }, grid: true));

        var (low, high) = RatioRange(bins, bands);
        model.Axes.Add(PlotAxisStyle.Styled(new LinearAxis
        {
            Key = RatioKey,
            Position = AxisPosition.Left,
            StartPosition = 0,
            EndPosition = 0.30,
            Title = "surrogate / ref.",
            AxisTitleDistance = 14,
            Minimum = low,
            Maximum = high,
            StringFormat = "0.###",
            MaximumMajorIntervalCount = 4,
        }, grid: true));

        AddBands(model, bands);
        AddDistributions(model, bins, viewLow, viewHigh);
        AddRatios(model, bins, bands, low, high, viewLow, viewHigh);
        return model;
    }

    private static void AddDistributions(PlotModel model, IReadOnlyList<ComparedBin> bins, double viewLow, double viewHigh)
    {
        var reference = new AreaSeries
        {
            Title = "reference (full simulation)",
            YAxisKey = MainKey,
            Color = Color(ReportPalette.Reference),
            Color2 = OxyColors.Transparent,
            Fill = OxyColor.FromAColor(150, Color(ReportPalette.ReferenceFill)),
            StrokeThickness = 1.8,
            ConstantY2 = 0,
        };
        reference.Points.AddRange(Steps(bins, b => b.Reference / b.Scale));
        model.Series.Add(reference);

        var surrogate = new LineSeries
        {
            Title = "surrogate ± 1σ",
            YAxisKey = MainKey,
            Color = Color(ReportPalette.Surrogate),
            StrokeThickness = 1.8,
            LineStyle = LineStyle.Solid,
        };
        surrogate.Points.AddRange(Steps(bins, b => b.Surrogate / b.Scale));
        model.Series.Add(surrogate);

        var errors = new ScatterErrorSeries
        {
            YAxisKey = MainKey,
            MarkerType = MarkerType.Circle,
            MarkerSize = 2.2,
            MarkerFill = Color(ReportPalette.Surrogate),
            ErrorBarColor = Color(ReportPalette.Surrogate),
            ErrorBarStrokeThickness = 1.4,
            ErrorBarStopWidth = 0,
            RenderInLegend = false,
        };
        foreach (var b in bins) errors.Points.Add(new ScatterErrorPoint(VisibleCentre(b, viewLow, viewHigh), b.Surrogate / b.Scale, 0, b.SurrogateError / b.Scale));
        model.Series.Add(errors);
    }

    private static void AddBands(PlotModel model, IReadOnlyList<ToleranceBand> bands)
    {
        // Core and tails (and a band over all bins) are filled; named regions, which overlap them, are outlined.
        foreach (var band in bands.OrderBy(b => b.Kind == Region.Named ? 1 : 0))
        {
            var named = band.Kind == Region.Named;
            var colour = Color(BandColour(band.Kind));
            foreach (var (lower, upper) in band.Spans)
                model.Annotations.Add(new RectangleAnnotation
                {
                    YAxisKey = RatioKey,
                    MinimumX = lower,
                    MaximumX = upper,
                    MinimumY = 1 - band.Tolerance,
                    MaximumY = 1 + band.Tolerance,
                    Fill = OxyColor.FromAColor(named ? (byte)40 : (byte)110, colour),
                    Stroke = named ? colour : OxyColors.Transparent,
                    StrokeThickness = named ? 1.6 : 0,
                    Layer = AnnotationLayer.BelowSeries,
                });
        }
        model.Annotations.Add(new LineAnnotation
        {
            Type = LineAnnotationType.Horizontal,
            YAxisKey = RatioKey,
            Y = 1,
            Color = Color(ReportPalette.Muted),
            LineStyle = LineStyle.Dash,
            StrokeThickness = 1,
            Layer = AnnotationLayer.BelowSeries,
        });
    }

    private static void AddRatios(PlotModel model, IReadOnlyList<ComparedBin> bins, IReadOnlyList<ToleranceBand> bands, double low, double high, double viewLow, double viewHigh)
    {
        var within = RatioSeries(ReportPalette.Ink, 2.4);
        var outside = RatioSeries(ReportPalette.Fail, 3.4);
        var offScale = new ScatterSeries
        {
            YAxisKey = RatioKey,
            MarkerType = MarkerType.Triangle,
            MarkerSize = 5,
            MarkerFill = Color(ReportPalette.Fail),
            RenderInLegend = false,
        };
        foreach (var b in bins)
        {
            if (b.Ratio is not { } r) continue;
            var limit = bands.Where(band => band.Spans.Any(s => b.Centre >= s.Lower && b.Centre <= s.Upper)).Select(band => band.Tolerance).DefaultIfEmpty(double.PositiveInfinity).Min();
            var series = Math.Abs(r.Ratio - 1) > limit ? outside : within;
            var centre = VisibleCentre(b, viewLow, viewHigh);
            var halfWidth = 0.5 * (Math.Min(b.Upper, viewHigh) - Math.Max(b.Lower, viewLow));
            series.Points.Add(new ScatterErrorPoint(centre, r.Ratio, halfWidth, r.Sigma));
            if (r.Ratio > high) offScale.Points.Add(new ScatterPoint(centre, high - 0.04 * (high - low)));
            else if (r.Ratio < low) offScale.Points.Add(new ScatterPoint(centre, low + 0.04 * (high - low)));
        }
        model.Series.Add(within);
        model.Series.Add(outside);
        model.Series.Add(offScale);
    }

    private static ScatterErrorSeries RatioSeries(string colour, double size) => new()
    {
        YAxisKey = RatioKey,
        MarkerType = MarkerType.Circle,
        MarkerSize = size,
        MarkerFill = Color(colour),
        ErrorBarColor = Color(colour),
        ErrorBarStrokeThickness = 1.2,
        ErrorBarStopWidth = 0,
        RenderInLegend = false,
    };

    /// <summary>The ratio axis: 1 ± the widest tolerance and every ratio ± σ, padded, within [0, 3].</summary>
    private static (double Low, double High) RatioRange(IReadOnlyList<ComparedBin> bins, IReadOnlyList<ToleranceBand> bands)
    {
        var tolerance = bands.Select(b => b.Tolerance).DefaultIfEmpty(0.05).Max();
        var low = 1 - tolerance;
        var high = 1 + tolerance;
        foreach (var b in bins)
        {
            if (b.Ratio is not { } r || !double.IsFinite(r.Ratio)) continue;
            low = Math.Min(low, r.Ratio - r.Sigma);
            high = Math.Max(high, r.Ratio + r.Sigma);
        }
        low = Math.Max(low, 0);
        high = Math.Min(high, 3);
        var pad = 0.08 * (high - low);
        return (Math.Max(0, low - pad), high + pad);
    }

    /// <summary>
    /// The value range shown: all bins, except that an outer bin of a continuous feature far wider than the rest (a
    /// quantile binning's last bin over a long tail) is cut to a quarter of the inner bins' span, so it does not
    /// squeeze them together. Discrete features and coarse binnings are shown whole.
    /// </summary>
    public static (double Low, double High) View(IReadOnlyList<double> edges, bool discrete)
    {
        if (discrete || edges.Count < 6) return (edges[0], edges[^1]);
        var inner = edges[^2] - edges[1];
        var low = edges[1] - edges[0] > 0.5 * inner ? edges[1] - 0.25 * inner : edges[0];
        var high = edges[^1] - edges[^2] > 0.5 * inner ? edges[^2] + 0.25 * inner : edges[^1];
        return (low, high);
    }

    /// <summary>Where a bin's markers go: the middle of its visible part.</summary>
    private static double VisibleCentre(ComparedBin b, double viewLow, double viewHigh) =>
        0.5 * (Math.Max(b.Lower, viewLow) + Math.Min(b.Upper, viewHigh));

    /// <summary>A step outline: each bin's value held from its lower to its upper edge.</summary>
    private static IEnumerable<DataPoint> Steps(IReadOnlyList<ComparedBin> bins, Func<ComparedBin, double> value)
    {
        foreach (var b in bins)
        {
            var y = value(b);
            yield return new DataPoint(b.Lower, y);
            yield return new DataPoint(b.Upper, y);
        }
    }

    public static string BandColour(Region kind) => kind switch
    {
        Region.Core => ReportPalette.CoreBand,
        Region.Tails => ReportPalette.TailsBand,
        Region.Named => ReportPalette.NamedBand,
        _ => ReportPalette.AllBand,
    };

    private static OxyColor Color(string hex) => OxyColor.Parse(hex);

    /// <summary>A tolerance as a percentage, e.g. "±3%".</summary>
    public static string Percent(double tolerance) => "±" + (tolerance * 100).ToString("0.##", CultureInfo.InvariantCulture) + "%";
}
