namespace GateTasks.Engine.Contracts;

/// <summary>
/// The contract's vocabulary, one list per mapping. The loader accepts exactly these keys; the JSON Schema in
/// docs/precision-contract.schema.json is tested to list the same ones.
/// </summary>
internal static class ContractKeys
{
    public const string Version = "contract-version";
    public const string Title = "title";
    public const string Sample = "sample";
    public const string Reference = "reference";
    public const string Defaults = "defaults";
    public const string Features = "features";

    public const string Path = "path";
    public const string Weight = "weight";

    public const string Name = "name";
    public const string Column = "column";
    public const string Kind = "kind";
    public const string Binning = "binning";
    public const string Core = "core";
    public const string Checks = "checks";
    public const string Spike = "spike";
    public const string Regions = "regions";
    public const string Categories = "categories";
    public const string By = "by";
    public const string Values = "values";
    public const string Quantiles = "quantiles";
    public const string Expression = "expression";
    public const string Selection = "selection";
    /// <summary>What a NaN or infinite value of a feature in the surrogate sample does: <c>fail</c> (the default) or <c>allow</c>.</summary>
    public const string NonFinite = "non-finite";
    public static readonly string[] NonFinitePolicies = ["fail", "allow"];

    public const string Bins = "bins";
    public const string Spacing = "spacing";
    public const string Range = "range";
    public const string Edges = "edges";

    public const string Tails = "tails";

    /// <summary>Written instead of a tolerance to switch a default check off for one feature.</summary>
    public const string Off = "off";

    /// <summary>Switches a goodness-of-fit test on.</summary>
    public const string On = "on";

    public const string Decision = "decision";
    public const string Acceptance = "acceptance";
    public const string Ledger = "ledger";
    public const string Required = "required";
    public const string Tightening = "tightening";
    public const string Ratchet = "ratchet";
    public const string Correlations = "correlations";
    public const string Joint = "joint";
    public const string FrechetMax = "frechet-max";
    public const string KernelDistanceMax = "kernel-distance-max";
    public const string SlicedKsMax = "sliced-ks-max";
    public const string SlicedWassersteinMax = "sliced-wasserstein-max";
    public const string Projections = "projections";
    public const string KernelRows = "kernel-rows";
    public const string Worst = "worst";
    public const string Mean = "mean";
    public static readonly string[] SlicedKeys = [Worst, Mean];
    /// <summary>Keys the joint block no longer takes: the energy test on a bounded subsample was retired.</summary>
    public static readonly string[] RetiredJointKeys = ["energy-test", "subsample", "permutations"];
    public const string PairFeatures = "features";
    /// <summary>A correlation entry's <c>features: all</c>: every pair of the contract's features.</summary>
    public const string AllPairs = "all";
    public const string PearsonMax = "pearson-max";
    public const string SpearmanMax = "spearman-max";
    public const string Chi2Test2D = "chi2-2d-test";
    public const string Confidence = "confidence";
    public const string FalseAlarm = "false-alarm";
    public const string Correction = "correction";
    public const string Inconclusive = "inconclusive";

    public static readonly string[] TopLevel = [Version, Title, Sample, Reference, Selection, Decision, Acceptance, Defaults, Features, Correlations, Joint];
    public static readonly string[] AcceptanceKeys = [Ledger, Required, Tightening, Ratchet];
    public static readonly string[] TighteningPolicies = ["free", "record"];
    public static readonly string[] JointKeys = [PairFeatures, FrechetMax, KernelDistanceMax, SlicedKsMax, SlicedWassersteinMax, Projections, KernelRows];
    public static readonly string[] CorrelationKeys = [PairFeatures, PearsonMax, SpearmanMax, Chi2Test2D];
    public static readonly string[] DecisionKeys = [Confidence, FalseAlarm, Correction, Inconclusive];
    public static readonly string[] Corrections = ["holm", "benjamini-hochberg", "bonferroni"];
    public static readonly string[] InconclusivePolicies = ["fail", "warn"];
    public static readonly string[] SampleKeys = [Path, Weight];
    public static readonly string[] DefaultsKeys = [Binning, Core, Regions, Checks, NonFinite];
    public static readonly string[] FeatureKeys = [Name, Column, Expression, Kind, Binning, Core, Regions, Spike, Categories, Checks, NonFinite];
    public const string PerCategory = "per-category";
    public const string ShareScaling = "share-scaling";
    public const string Rule = "rule";
    public const string FullShare = "full-share";
    public const string AtMost = "at-most";
    public static readonly string[] CategoryKeys = [By, Values, "fraction-max", PerCategory, ShareScaling];
    public static readonly string[] ShareScalingKeys = [Rule, FullShare, AtMost];
    /// <summary>The rules <c>share-scaling</c> knows: the tolerance widened as 1/√share.</summary>
    public static readonly string[] ShareScalingRules = ["inverse-sqrt"];
    public static readonly string[] BinningKeys = [Bins, Spacing, Range, Edges];
    public static readonly string[] NamedRegionKeys = [Range, Quantiles];
    public static readonly string[] Kinds = ["continuous", "discrete"];
    public static readonly string[] Spacings = ["quantile", "uniform"];

    private static readonly (string Key, CheckKind Kind)[] CheckTable =
    [
        ("ks-max", CheckKind.KolmogorovSmirnov),
        ("wasserstein-max", CheckKind.Wasserstein),
        ("chi2-test", CheckKind.ChiSquareTest),
        ("ks-test", CheckKind.KolmogorovSmirnovTest),
        ("ad-test", CheckKind.AndersonDarlingTest),
        ("cvm-test", CheckKind.CramerVonMisesTest),
        ("ratio-max", CheckKind.BinRatio),
        ("jsd-max", CheckKind.JensenShannon),
        ("mean-shift-max", CheckKind.MeanShift),
        ("width-ratio-max", CheckKind.WidthRatio),
        ("quantile-shift-max", CheckKind.QuantileShift),
        ("iqr-width-ratio-max", CheckKind.InterquartileWidthRatio),
        ("fraction-max", CheckKind.Fraction),
        ("far-tail-max", CheckKind.FarTail),
    ];

    /// <summary>Every check key, in the order checks are reported.</summary>
    public static IEnumerable<string> CheckKeys => CheckTable.Select(c => c.Key);

    /// <summary>The check a key names, or null.</summary>
    public static CheckKind? CheckFromKey(string key)
    {
        foreach (var (k, kind) in CheckTable)
            if (k == key) return kind;
        return null;
    }

    /// <summary>The key that names a check.</summary>
    public static string CheckKey(CheckKind kind) => kind switch
    {
        CheckKind.PearsonDifference => PearsonMax,
        CheckKind.SpearmanDifference => SpearmanMax,
        CheckKind.FrechetDistance => FrechetMax,
        CheckKind.KernelDistance => KernelDistanceMax,
        CheckKind.SlicedKolmogorovSmirnov => SlicedKsMax,
        CheckKind.SlicedWasserstein => SlicedWassersteinMax,
        CheckKind.ChiSquare2DTest => Chi2Test2D,
        _ => CheckTable.First(c => c.Kind == kind).Key,
    };

    /// <summary>Checks whose tolerance can be split into core and tails.</summary>
    public static bool HasRegions(CheckKind kind) => kind == CheckKind.BinRatio;

    /// <summary>Goodness-of-fit tests: switched on or off, without a tolerance.</summary>
    public static bool IsTest(CheckKind kind) =>
        kind is CheckKind.ChiSquareTest or CheckKind.KolmogorovSmirnovTest or CheckKind.AndersonDarlingTest or CheckKind.CramerVonMisesTest
            or CheckKind.ChiSquare2DTest;
}
