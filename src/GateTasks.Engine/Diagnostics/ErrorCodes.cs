namespace GateTasks.Engine.Diagnostics;

/// <summary>
/// Stable error codes. GATE0xxx set-up and usage, GATE1xxx contract, GATE2xxx sample and reference input,
/// GATE3xxx drift (a check that did not pass). Documented in docs/error-codes.md; never renumber.
/// </summary>
public static class ErrorCodes
{
    /// <summary>Command-line usage error.</summary>
    public const string Usage = "GATE0001";
    /// <summary>An output (report, reference) could not be written.</summary>
    public const string OutputNotWritable = "GATE0002";

    /// <summary>A report written while a check runs: the check has not finished (or was stopped before it could).</summary>
    public const string CheckUnfinished = "GATE0003";
    /// <summary>An output path names an input of the same run (links followed), or two outputs name one file.</summary>
    public const string OutputIsInput = "GATE0004";
    /// <summary>An output path names something other than a regular file (a device, a named pipe, a socket, a folder).</summary>
    public const string OutputNotRegular = "GATE0005";
    /// <summary>An input path names something other than a regular file (a device, a named pipe, a socket).</summary>
    public const string InputNotRegular = "GATE0006";
    /// <summary>A contract file larger than a contract can sensibly be.</summary>
    public const string ContractTooLarge = "GATE0007";
    /// <summary><c>check --plots</c> names something other than a folder or a new path (a file, an input of the run included, a device, a pipe).</summary>
    public const string PlotsNotFolder = "GATE0018";
    /// <summary>The folder <c>check --plots</c> names cannot be created.</summary>
    public const string PlotsFolderNotCreated = "GATE0019";

    /// <summary>The contract file does not exist or cannot be read.</summary>
    public const string ContractNotFound = "GATE1001";
    /// <summary>The contract is not well-formed YAML.</summary>
    public const string ContractSyntax = "GATE1002";
    /// <summary>A key the schema does not know.</summary>
    public const string ContractUnknownKey = "GATE1003";
    /// <summary>A value of the wrong type or out of range.</summary>
    public const string ContractBadValue = "GATE1004";
    /// <summary>A required key is absent.</summary>
    public const string ContractMissingKey = "GATE1005";
    /// <summary>Two features share a name.</summary>
    public const string ContractDuplicateFeature = "GATE1006";
    /// <summary>A feature names a column the sample or reference does not have.</summary>
    public const string ContractUnknownColumn = "GATE1007";
    /// <summary>The contract's schema version is not supported.</summary>
    public const string ContractVersion = "GATE1008";
    /// <summary>An expression (derived feature or selection) that does not parse or names something unknown.</summary>
    public const string ContractExpression = "GATE1009";
    /// <summary>The reference or acceptance ledger lies outside the repository that holds the contract.</summary>
    public const string ContractPathOutsideRepository = "GATE1010";
    /// <summary>A category block's <c>per-category</c> names a category that is not a number of its <c>values</c>.</summary>
    public const string CategoryNotListed = "GATE1011";
    /// <summary>A category's own checks name a check (or region) the block's feature does not have.</summary>
    public const string CategoryCheckNotInherited = "GATE1012";
    /// <summary>Two entries of <c>per-category</c> name the same category.</summary>
    public const string CategoryRepeated = "GATE1013";
    /// <summary>A category block's <c>share-scaling</c> names a rule that does not exist.</summary>
    public const string ShareScalingRule = "GATE1014";
    /// <summary>A category block's <c>share-scaling</c> bound out of range (<c>full-share</c> outside (0, 1], <c>at-most</c> below 1).</summary>
    public const string ShareScalingBound = "GATE1015";
    /// <summary>A joint block states a key that was retired (the energy test and its subsample settings).</summary>
    public const string ContractRetiredKey = "GATE1016";
    /// <summary>An expression writes logic as a word (<c>and</c>, <c>or</c>, <c>not</c>); the operators are <c>&amp;&amp;</c>, <c>||</c>, <c>!</c>.</summary>
    public const string ExpressionLogicWord = "GATE1017";
    /// <summary>An expression quotes a column name in backquotes; a column name that is not an identifier goes in braces, <c>{jet pt}</c>.</summary>
    public const string ExpressionBackquotedName = "GATE1018";
    /// <summary>YAML read an expression as something other than text (a mapping, a list, a tag) because it was not quoted.</summary>
    public const string ExpressionNotQuotedInYaml = "GATE1019";

    /// <summary>No sample file matches, or a sample file does not exist.</summary>
    public const string SampleNotFound = "GATE2001";
    /// <summary>A sample file is corrupt or not in a supported format.</summary>
    public const string SampleUnreadable = "GATE2002";
    /// <summary>A column has a type that cannot be read as numbers.</summary>
    public const string SampleColumnType = "GATE2003";
    /// <summary>A column requested from a sample is not present in one of its files.</summary>
    public const string SampleColumnMissing = "GATE2004";
    /// <summary>The sample has no events.</summary>
    public const string SampleEmpty = "GATE2005";
    /// <summary>A CSV cell is not a number.</summary>
    public const string SampleCsvValue = "GATE2006";
    /// <summary>The weight column holds a non-finite value.</summary>
    public const string SampleBadWeight = "GATE2007";

    /// <summary>The weights of a sample sum to zero or below (all zero, or negatives outweigh positives): it cannot be normalised.</summary>
    public const string SampleWeightsNotNormalisable = "GATE2010";
    /// <summary>Every weight of a sample is so small that its square is not a normal double.</summary>
    public const string SampleWeightsTooSmall = "GATE2011";

    /// <summary>A NumPy array (a .npy file or a member of a .npz archive) whose header cannot be read: no NUMPY signature, an unknown format version, a header that is not the dictionary NumPy writes.</summary>
    public const string SampleArrayHeader = "GATE2012";
    /// <summary>An array file holds fewer (or more) bytes than its header's shape and dtype need: truncated, or bytes appended; an HDF5 file shorter than the end its superblock records.</summary>
    public const string SampleArraySize = "GATE2013";
    /// <summary>An array's shape cannot be read as named columns: a plain (not structured) .npy array, a 2-D or higher array, a 0-d scalar; an HDF5 dataset that is not 1-D.</summary>
    public const string SampleArrayShape = "GATE2014";
    /// <summary>The columns a sample file gives (the members of a .npz, the datasets of an HDF5 group) have different lengths.</summary>
    public const string SampleColumnLengths = "GATE2015";
    /// <summary>A NumPy array holds Python objects (stored as a pickle), which are never loaded.</summary>
    public const string SampleArrayObjects = "GATE2016";
    /// <summary>A sample file's content does not match its extension (a .npy that is not a NumPy array, an .h5 without the HDF5 signature …).</summary>
    public const string SampleContentMismatch = "GATE2017";
    /// <summary>An HDF5 dataset is compressed with a filter the reader cannot decode.</summary>
    public const string SampleHdf5Filter = "GATE2018";
    /// <summary>A .npz archive or an HDF5 file holds no array that can be read as columns.</summary>
    public const string SampleNoColumns = "GATE2019";

    /// <summary>A feature of the surrogate sample holds NaN or infinite values, and its contract does not allow them.</summary>
    public const string SampleNonFinite = "GATE2008";
    /// <summary>A continuous feature takes a single value throughout the reference sample.</summary>
    public const string ReferenceNoSpread = "GATE2009";
    /// <summary>The reference file does not exist.</summary>
    public const string ReferenceNotFound = "GATE2101";
    /// <summary>The reference file is corrupt or of an unsupported format version.</summary>
    public const string ReferenceUnreadable = "GATE2102";
    /// <summary>The reference lacks a feature the contract checks, or was built with other binning.</summary>
    public const string ReferenceMismatch = "GATE2103";
    /// <summary>A feature's bins (flows aside) hold less than half of the reference: its edges or range miss the reference.</summary>
    public const string ReferenceOutsideBins = "GATE2104";
    /// <summary>A named region a check uses holds no reference events.</summary>
    public const string ReferenceRegionEmpty = "GATE2105";
    /// <summary>A derived feature's expression gives NaN or infinite values in the reference sample, and its contract does not allow them.</summary>
    public const string ReferenceNonFinite = "GATE2106";
    /// <summary>A partial file (from 'gatetasks fill' or 'merge') cannot be read.</summary>
    public const string PartialUnreadable = "GATE2201";
    /// <summary>A partial file was filled for another contract or reference.</summary>
    public const string PartialMismatch = "GATE2202";
    /// <summary>Two partial files count the same sample file (same content), or are copies of each other: its events would be counted twice.</summary>
    public const string PartialOverlap = "GATE2203";
    /// <summary>Two files of one sample have the same content (a copy under another name): its events would be counted twice.</summary>
    public const string SampleDuplicateContent = "GATE2204";
    /// <summary>A partial file's content does not match its seal: edited or damaged after it was written.</summary>
    public const string PartialSealBroken = "GATE2205";
    /// <summary>A partial file's numbers contradict each other (cells against totals, negative counts or sums of squares).</summary>
    public const string PartialInconsistent = "GATE2206";

    /// <summary>Kolmogorov–Smirnov distance above tolerance.</summary>
    public const string DriftKolmogorovSmirnov = "GATE3001";
    /// <summary>Normalised Wasserstein-1 distance above tolerance.</summary>
    public const string DriftWasserstein = "GATE3002";
    /// <summary>χ² homogeneity test significant at the contract's family-wise level.</summary>
    public const string DriftChiSquare = "GATE3003";
    /// <summary>Bin ratio outside tolerance in the core region.</summary>
    public const string DriftRatioCore = "GATE3004";
    /// <summary>Bin ratio outside tolerance in the tail regions.</summary>
    public const string DriftRatioTails = "GATE3005";
    /// <summary>Jensen–Shannon divergence above tolerance.</summary>
    public const string DriftJensenShannon = "GATE3006";
    /// <summary>Bin ratio outside tolerance over all bins (a tolerance not split into core and tails).</summary>
    public const string DriftRatioAll = "GATE3007";
    /// <summary>Kolmogorov–Smirnov test significant at the contract's family-wise level.</summary>
    public const string DriftKolmogorovSmirnovTest = "GATE3008";
    /// <summary>Anderson–Darling test significant at the contract's family-wise level.</summary>
    public const string DriftAndersonDarlingTest = "GATE3011";
    /// <summary>Cramér–von Mises test significant at the contract's family-wise level.</summary>
    public const string DriftCramerVonMisesTest = "GATE3012";
    /// <summary>Mean shift shown above tolerance.</summary>
    public const string DriftMeanShift = "GATE3009";
    /// <summary>Width ratio shown outside tolerance.</summary>
    public const string DriftWidthRatio = "GATE3010";
    /// <summary>Quantile shift shown above tolerance.</summary>
    public const string DriftQuantileShift = "GATE3013";
    /// <summary>A spike or category fraction shown outside tolerance.</summary>
    public const string DriftFraction = "GATE3014";
    /// <summary>A correlation coefficient of a declared pair shown outside tolerance.</summary>
    public const string DriftCorrelation = "GATE3015";
    /// <summary>A far-tail fraction shown outside tolerance.</summary>
    public const string DriftFarTail = "GATE3016";
    /// <summary>Bin ratio outside tolerance in a region the feature declares by name.</summary>
    public const string DriftRatioNamed = "GATE3017";
    /// <summary>The χ² test of a declared pair's 2-D histograms significant at the family-wise level.</summary>
    public const string DriftChiSquare2D = "GATE3019";
    /// <summary>Interquartile width ratio shown outside tolerance.</summary>
    public const string DriftInterquartileWidth = "GATE3020";
    /// <summary>
    /// A subject (feature, category, pair, joint block) has goodness-of-fit tests and no tolerance check: nothing shows
    /// it within a tolerance, so the run is UNDECIDED (an error with <c>decision.inconclusive: fail</c>, else a warning).
    /// </summary>
    public const string SubjectWithoutTolerance = "GATE3021";
    /// <summary>The Fréchet distance of the joint feature set shown above its tolerance (<c>frechet-max</c>).</summary>
    public const string DriftFrechet = "GATE3022";
    /// <summary>The unbiased kernel distance of the joint feature set shown above its tolerance (<c>kernel-distance-max</c>).</summary>
    public const string DriftKernelDistance = "GATE3023";
    /// <summary>The worst or mean projected KS distance of the joint feature set shown above its tolerance (<c>sliced-ks-max</c>).</summary>
    public const string DriftSlicedKolmogorovSmirnov = "GATE3024";
    /// <summary>The worst or mean projected W1/σ of the joint feature set shown above its tolerance (<c>sliced-wasserstein-max</c>).</summary>
    public const string DriftSlicedWasserstein = "GATE3025";
    /// <summary>
    /// Partial files whose sliced histograms were filled on other projections or grids than each other's or the
    /// reference's (their grid digests differ): adding them cell by cell would mix different cells.
    /// </summary>
    public const string PartialSlicedGridMismatch = "GATE3026";
    /// <summary>The contract has no acceptance ledger (a warning, an error with <c>acceptance.required: on</c>).</summary>
    public const string LedgerMissing = "GATE4001";
    /// <summary>An accepted entry of the ledger was edited, removed or reordered.</summary>
    public const string LedgerTampered = "GATE4002";
    /// <summary>A tolerance was loosened, a check removed or a definition changed without an accepted entry.</summary>
    public const string LedgerUnrecordedLoosening = "GATE4003";
    /// <summary>The reference differs from the accepted one and no entry records it.</summary>
    public const string LedgerUnrecordedReference = "GATE4004";
    /// <summary>A tolerance was tightened without an entry, where the contract asks for tightening to be recorded.</summary>
    public const string LedgerUnrecordedTightening = "GATE4005";
    /// <summary>A ledger line cannot be read.</summary>
    public const string LedgerSyntax = "GATE4006";
    /// <summary>'accept' refused: the check does not pass, so there is no state to record.</summary>
    public const string AcceptRefused = "GATE4007";
    /// <summary>A check's margin fell below the last accepted one by more than its noise (the ratchet).</summary>
    public const string RatchetDegraded = "GATE4010";
    /// <summary>A base revision is in effect but the <c>git</c> program cannot be started.</summary>
    public const string GitUnavailable = "GATE4011";
    /// <summary>The base revision names no commit in the repository that holds the ledger.</summary>
    public const string BaseRevisionUnknown = "GATE4012";
    /// <summary>The ledger's folder is not in a Git work tree, or <c>git</c> failed otherwise.</summary>
    public const string GitFailed = "GATE4013";
    /// <summary>The acceptance ledger's path is a directory.</summary>
    public const string LedgerIsDirectory = "GATE4014";
    /// <summary>The ledger as committed at the base revision cannot be read or its chain is broken.</summary>
    public const string BaseLedgerUnreadable = "GATE4015";
    /// <summary>A check the sample is too small to decide (an error or a warning, by the contract's policy).</summary>
    public const string Inconclusive = "GATE3100";
}
