using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>Receives one feature's values of one batch, with the batch's weights (empty: unit weights).</summary>
internal delegate void FeatureBatch(int feature, ReadOnlySpan<double> values, ReadOnlySpan<double> weights);

/// <summary>
/// Offered one feature's values of one batch with unit weights, as stored float32 values (the same numbers the
/// <see cref="FeatureBatch"/> would get as doubles); returns false to be given them as doubles instead.
/// </summary>
internal delegate bool FeatureBatchFloat32(int feature, ReadOnlySpan<float> values);

/// <summary>Event totals of one pass over a sample (events that passed the selection); Σw and Σw² as exact sums, for merging with other shards.</summary>
internal sealed record SampleTotals(long Events, Statistics.ExactSum ExactSumW, Statistics.ExactSum ExactSumW2)
{
    public double SumW => ExactSumW.Value;
    public double SumW2 => ExactSumW2.Value;
}

/// <summary>
/// One streamed pass over a sample: reads each needed column once per batch, evaluates derived features
/// column-wise, applies the selection, rejects non-finite weights, and hands every feature's values to the visitor and
/// the whole batch to each batch visitor. Buffers are reused across batches, so memory is bounded by the batch size.
/// </summary>
internal sealed class SampleStream
{
    /// <summary>Batches with at least this many rows visit their features in parallel.</summary>
    private const int ParallelBatchRows = 8192;

    private readonly Sample _sample;
    private readonly ReadPass _pass;
    private readonly FeatureSources _inputs;
    private readonly string? _weightColumn;
    private readonly Dictionary<string, int> _index;
    private readonly int _weightIndex;
    private readonly int _n;

    // Per feature: the derived values (expressions), the selected rows (with a selection), and the values in the view.
    private readonly double[][] _derived;
    private readonly double[][] _selected;
    private readonly double[][] _view;
    private readonly double[][]?[] _expressionInputs;
    // Per feature with a condition of its own: its mask, and its values and weights compacted on their own.
    private readonly double[]?[] _ownMask;
    private readonly double[]?[] _ownValues;
    private readonly double[]?[] _ownWeights;
    private readonly int[] _ownRows;
    // Without a selection, a category's rows are found once per condition (the rows that pass it, in order) and each
    // feature gathers its own values from them in its own visit, side by side with the others, from the stored floats
    // where it can; per feature: those rows (shared with the earlier feature of the same condition), the batch column
    // it reads straight or -1, and its gathered floats.
    private readonly int[]?[] _ownIndex;
    private readonly int[] _ownColumn;
    private readonly float[]?[] _ownFloats;
    // Per feature: an earlier feature whose expression (condition) has the same text, whose values (mask) this batch it
    // takes rather than evaluating them again, or -1 (a category block repeats its expression for every feature).
    private readonly int[] _sameExpression, _sameCondition;
    // Without a selection, the categories of a block (conditions by == value with the same by) are sorted out at once
    // (CategoryRows), from one evaluation of by: per feature the first feature of its by (-1: no category); per such
    // first feature the conditions' first features, their values, a feature whose expression is by itself (its
    // values taken) or -1, and by's values when evaluated here.
    private readonly int[] _byGroup;
    private readonly int[]?[] _byConditions;
    private readonly double[]?[] _byCategories;
    private readonly int[] _byFeature;
    private readonly double[]?[] _byValues;
    // Per feature: the batch column it reads straight (no expression, selection or condition), converted to doubles
    // only when first read as doubles; -1 for a feature whose values are ready before the visits.
    private readonly int[] _deferredColumn;
    private int[] _earlyFeature = [];
    private SampleBatch? _batch;
    private double[] _weights = [];
    private double[] _mask = [];
    private long[] _fileRows = [];
    private FeatureView _frame;

    // Whether a batch visitor reads the view: only they read the rows' places in their files.
    private bool _viewRead;
    private long _events, _read;
    private double _largestWeight;
    // Per batch in doubles, then exactly: totals that do not depend on how batches are grouped.
    private readonly Statistics.ExactSum _sumW = new();
    private readonly Statistics.ExactSum _sumW2 = new();

    private SampleStream(Sample sample, FeatureSources inputs, string? weightColumn, ReadPass pass)
    {
        _sample = sample;
        _pass = pass;
        _inputs = inputs;
        _weightColumn = weightColumn;
        Columns = inputs.RequiredColumns.ToList();
        if (weightColumn is not null && !Columns.Contains(weightColumn)) Columns.Add(weightColumn);
        _index = Columns.Select((c, i) => (c, i)).ToDictionary(p => p.c, p => p.i, StringComparer.Ordinal);
        _weightIndex = weightColumn is null ? -1 : _index[weightColumn];
        _n = inputs.Count;
        _derived = new double[_n][];
        _selected = new double[_n][];
        _view = new double[_n][];
        _expressionInputs = inputs.Expressions.Select(e => e is null ? null : new double[e.Columns.Count][]).ToArray();
        _ownMask = new double[]?[_n];
        _ownValues = new double[]?[_n];
        _ownWeights = new double[]?[_n];
        _ownRows = new int[_n];
        _ownIndex = new int[]?[_n];
        _ownColumn = new int[_n];
        _ownFloats = new float[]?[_n];
        _sameExpression = EarlierWithSameText(inputs.Expressions);
        _sameCondition = EarlierWithSameText(inputs.Conditions);
        _deferredColumn = new int[_n];
        (_byGroup, _byConditions, _byCategories, _byFeature) = GroupCategories(inputs, _sameCondition);
        _byValues = new double[]?[_n];
        _frame = new FeatureView(_view, _weights, weightColumn is not null, _fileRows) { Prepare = PrepareFeature };
    }

    private static int[] EarlierWithSameText(IReadOnlyList<Expressions.CompiledExpression?> expressions) =>
        expressions.Select((e, i) => e is null ? -1
            : Enumerable.Range(0, i).FirstOrDefault(j => expressions[j] is { } earlier && string.Equals(earlier.Text, e.Text, StringComparison.Ordinal), -1)).ToArray();

    // The categories that share a by, each block's conditions once (the first feature of each condition text).
    private static (int[] Group, int[]?[] Conditions, double[]?[] Categories, int[] ByFeature) GroupCategories(FeatureSources inputs, int[] sameCondition)
    {
        var n = inputs.Count;
        var group = Enumerable.Repeat(-1, n).ToArray();
        var conditions = new int[]?[n];
        var categories = new double[]?[n];
        var byFeature = Enumerable.Repeat(-1, n).ToArray();
        if (inputs.Selection is not null) return (group, conditions, categories, byFeature);
        for (var i = 0; i < n; i++)
        {
            if (inputs.Categories[i] is not { } category) continue;
            var by = category.By.Text;
            group[i] = Enumerable.Range(0, i + 1).First(j => inputs.Categories[j] is { } c && string.Equals(c.By.Text, by, StringComparison.Ordinal));
            if (group[i] != i) continue;
            var members = Enumerable.Range(i, n - i).Where(j => sameCondition[j] < 0 && inputs.Categories[j] is { } c && string.Equals(c.By.Text, by, StringComparison.Ordinal)).ToArray();
            conditions[i] = members;
            categories[i] = members.Select(j => inputs.Categories[j]!.Value).ToArray();
            byFeature[i] = Enumerable.Range(0, n).FirstOrDefault(j => inputs.Conditions[j] is null && inputs.Expressions[j] is { } e
                && string.Equals(e.Text, by, StringComparison.Ordinal), -1);
        }
        return (group, conditions, categories, byFeature);
    }

    /// <summary>Every column the pass reads: the features', the expressions', the selection's and the weight.</summary>
    private List<string> Columns { get; }

    /// <summary>
    /// Streams <paramref name="sample"/> once: each feature's values of each batch to <paramref name="visit"/> and the
    /// whole batch to each of <paramref name="batchVisits"/>; <paramref name="settings"/> names the pass, its progress
    /// and its threads. Features and batch visitors may run side by side, so each must touch only state of its own
    /// (a feature visit that feature's, a batch visitor its own) and none may change the batch.
    /// </summary>
    public static SampleTotals Run(Sample sample, FeatureSources inputs, string? weightColumn, FeatureBatch visit,
        IReadOnlyList<Action<FeatureView>>? batchVisits = null, ReadPass? settings = null, FeatureBatchFloat32? visitFloat32 = null)
    {
        var pass = new SampleStream(sample, inputs, weightColumn, settings ?? ReadPass.Default);
        pass._earlyFeature = pass.EarlyFeatures(visitFloat32 is not null);
        pass._viewRead = batchVisits is { Count: > 0 };
        var readPass = pass._pass;
        if (visitFloat32 is not null && pass._earlyFeature.Any(f => f >= 0))
            readPass = readPass with
            {
                OnDecoded = (column, values) => pass._earlyFeature[column] is var i and >= 0 && visitFloat32(i, values),
                UnreadOnceTaken = pass.UnreadOnceTaken(batchVisits?.Count ?? 0),
            };
        foreach (var batch in sample.ReadBatches(pass.Columns, readPass))
        {
            var rows = batch.RowCount;
            pass.Reserve(rows);
            pass.CheckWeights(batch);
            pass.Derive(batch);
            pass.SelectOwn(batch);
            pass.Select(batch);
            pass.Total();
            pass.Visit(visit, batchVisits ?? [], visitFloat32);
        }
        if (weightColumn is not null)
            SampleWeights.RequireRepresentableSquares(pass._largestWeight, weightColumn, sample.Files, new SourceLocation(sample.Files[0]));
        return new SampleTotals(pass._events, pass._sumW, pass._sumW2);
    }

    // Per column: the one feature that reads it straight (no expression, selection, condition or weights), whose
    // float32 values may be taken as the column is decoded; -1 for a column read otherwise or by several features.
    private int[] EarlyFeatures(bool floatVisits)
    {
        var early = Enumerable.Repeat(-1, Columns.Count).ToArray();
        if (!floatVisits || _weightIndex >= 0 || _inputs.Selection is not null) return early;
        var readers = new int[Columns.Count];
        for (var i = 0; i < _n; i++)
        {
            if (_inputs.FeatureColumns[i] is not { } column) continue;
            var c = _index[column];
            readers[c]++;
            if (_inputs.Expressions[i] is null && _sameExpression[i] < 0 && _inputs.Conditions[i] is null) early[c] = i;
        }
        for (var c = 0; c < early.Length; c++)
            if (readers[c] != 1) early[c] = -1;
        return early;
    }

    // Per column: whether its values, once taken as decoded by its one feature, are read by nothing else: no batch
    // visitor (which may read any feature), no expression and no condition.
    private bool[] UnreadOnceTaken(int batchVisits)
    {
        var read = new HashSet<string>(StringComparer.Ordinal);
        foreach (var e in _inputs.Expressions.Concat(_inputs.Conditions).Append(_inputs.Selection))
            if (e is not null) read.UnionWith(e.Columns);
        return _earlyFeature.Select((f, c) => f >= 0 && batchVisits == 0 && !read.Contains(Columns[c])).ToArray();
    }

    // Buffers grow to the largest batch, then are reused. Only what is used: a derived buffer per expression, a selected
    // one per feature when there is a selection.
    private void Reserve(int rows)
    {
        if (_mask.Length >= rows) return;
        _mask = new double[rows];
        _weights = new double[rows];
        _fileRows = new long[rows];
        for (var i = 0; i < _n; i++)
        {
            _derived[i] = _inputs.Expressions[i] is null ? [] : new double[rows];
            _selected[i] = _inputs.Selection is null ? [] : new double[rows];
        }
        _frame = new FeatureView(_view, _weights, _weightColumn is not null, _fileRows) { Prepare = PrepareFeature };
    }

    // Before a feature's doubles are read (by its visit or by a batch visitor): converts its column if still pending.
    private void PrepareFeature(int feature)
    {
        if (_deferredColumn[feature] >= 0) _batch!.Convert(_deferredColumn[feature]);
    }

    private void CheckWeights(SampleBatch batch)
    {
        var rawWeights = _weightIndex >= 0 ? batch.Column(_weightIndex) : ReadOnlySpan<double>.Empty;
        for (var r = 0; r < rawWeights.Length; r++)
        {
            var w = rawWeights[r];
            if (!double.IsFinite(w))
                throw BadWeight(_sample.CurrentFile ?? _sample.Files[0], batch, _weightColumn!, _weightIndex, r, _read + r, w, "every event needs a finite weight");
            _largestWeight = Math.Max(_largestWeight, Math.Abs(w));
        }
        _read += batch.RowCount;
        if (_weightIndex >= 0) rawWeights.CopyTo(_weights);
    }

    // A column is used in place, an expression is evaluated over the whole batch.
    private void Derive(SampleBatch batch)
    {
        var rows = batch.RowCount;
        _batch = batch;
        for (var i = 0; i < _n; i++)
        {
            _deferredColumn[i] = -1;
            _ownColumn[i] = -1;
            if (_sameExpression[i] >= 0) _view[i] = _derived[_sameExpression[i]];
            else if (_inputs.Expressions[i] is { } e)
            {
                var args = _expressionInputs[i]!;
                for (var a = 0; a < args.Length; a++) args[a] = batch.ColumnBuffer(_index[e.Columns[a]]);
                e.Evaluate(args, rows, _derived[i].AsSpan(0, rows));
                _view[i] = _derived[i];
            }
            else if (_inputs.Selection is null && _inputs.Conditions[i] is not null)
            {
                // A category's values, gathered in its visit: converted there if read as doubles at all.
                _deferredColumn[i] = _ownColumn[i] = _index[_inputs.FeatureColumns[i]!];
                _view[i] = batch.DeferredBuffer(_deferredColumn[i]);
            }
            else if (_inputs.Selection is null && _inputs.Conditions[i] is null)
            {
                // Read by the feature's own visit (or a batch visitor) only: converted there, if at all.
                _deferredColumn[i] = _index[_inputs.FeatureColumns[i]!];
                _view[i] = batch.DeferredBuffer(_deferredColumn[i]);
            }
            else _view[i] = batch.ColumnBuffer(_index[_inputs.FeatureColumns[i]!]);
        }
        // The selection's mask (NaN counts as false); without a selection it is not read (SelectOwn and Select read it
        // only with one), so it is not filled either.
        if (_inputs.Selection is { } selection)
        {
            var selectionArgs = selection.Columns.Select(c => batch.ColumnBuffer(_index[c])).ToArray();
            selection.Evaluate(selectionArgs, rows, _mask.AsSpan(0, rows));
        }

    }

    // A feature with a condition of its own (a category) keeps the rows that pass both; it is compacted on its own.
    private void SelectOwn(SampleBatch batch)
    {
        var rows = batch.RowCount;
        for (var i = 0; i < _n; i++)
        {
            if (_inputs.Conditions[i] is not { } condition) continue;
            _ownMask[i] ??= new double[_mask.Length];
            if (_ownMask[i]!.Length < rows) _ownMask[i] = new double[rows];
            _ownValues[i] ??= new double[_mask.Length];
            if (_ownValues[i]!.Length < rows) { _ownValues[i] = new double[rows]; _ownWeights[i] = new double[rows]; }
            _ownWeights[i] ??= new double[_ownValues[i]!.Length];
            if (_byGroup[i] >= 0)
            {
                // Sorted with the other categories of its by, at the first of them (earlier, or this one).
                if (_byGroup[i] == i) SortCategories(i, batch);
                if (_sameCondition[i] >= 0) _ownRows[i] = _ownRows[_sameCondition[i]];
                continue;
            }
            var own = _sameCondition[i] >= 0 ? _ownMask[_sameCondition[i]]! : _ownMask[i]!;
            if (_sameCondition[i] < 0)
            {
                var conditionArgs = condition.Columns.Select(c => batch.ColumnBuffer(_index[c])).ToArray();
                condition.Evaluate(conditionArgs, rows, own.AsSpan(0, rows));
            }
            if (_inputs.Selection is null)
            {
                // The rows only, once per condition; the values are gathered in the feature's visit (GatherOwn).
                if (_sameCondition[i] >= 0)
                {
                    _ownRows[i] = _ownRows[_sameCondition[i]];
                    continue;
                }
                if (_ownIndex[i] is not { } index || index.Length < rows) _ownIndex[i] = index = new int[_mask.Length];
                _ownRows[i] = PassingRows(own.AsSpan(0, rows), index);
                continue;
            }
            var k = 0;
            for (var r = 0; r < rows; r++)
            {
                if (!Passes(_mask[r]) || !Passes(own[r])) continue;
                _ownValues[i]![k] = _view[i][r];
                _ownWeights[i]![k] = _weightIndex >= 0 ? _weights[r] : 1;
                k++;
            }
            _ownRows[i] = k;
        }
    }

    // The rows of each condition of by's block, from by's values: a feature's (derived before this) or evaluated here.
    private void SortCategories(int first, SampleBatch batch)
    {
        var rows = batch.RowCount;
        ReadOnlySpan<double> by;
        if (_byFeature[first] >= 0) by = _view[_byFeature[first]].AsSpan(0, rows);
        else
        {
            var expression = _inputs.Categories[first]!.By;
            if (_byValues[first] is not { } values || values.Length < rows) _byValues[first] = values = new double[_mask.Length];
            expression.Evaluate(expression.Columns.Select(c => batch.ColumnBuffer(_index[c])).ToArray(), rows, values.AsSpan(0, rows));
            by = values.AsSpan(0, rows);
        }
        var conditions = _byConditions[first]!;
        var lists = new int[conditions.Length][];
        for (var k = 0; k < conditions.Length; k++)
        {
            if (_ownIndex[conditions[k]] is not { } index || index.Length < rows) _ownIndex[conditions[k]] = index = new int[_mask.Length];
            lists[k] = index;
        }
        Span<int> counts = stackalloc int[conditions.Length];
        CategoryRows.Sort(by, _byCategories[first], lists, counts);
        for (var k = 0; k < conditions.Length; k++) _ownRows[conditions[k]] = counts[k];
    }

    // Keeps the rows whose selection holds, compacted into the same view.
    private void Select(SampleBatch batch)
    {
        var rows = batch.RowCount;
        var kept = rows;
        var first = _sample.BatchFirstRowInFile;
        if (_inputs.Selection is not null)
        {
            kept = 0;
            for (var r = 0; r < rows; r++)
            {
                if (!Passes(_mask[r])) continue;
                for (var i = 0; i < _n; i++) _selected[i][kept] = _view[i][r];
                _weights[kept] = _weightIndex >= 0 ? _weights[r] : 1;
                _fileRows[kept] = first + r;
                kept++;
            }
            for (var i = 0; i < _n; i++) _view[i] = _selected[i];
        }
        else if (_viewRead)
            for (var r = 0; r < rows; r++) _fileRows[r] = first + r;
        _frame.Rows = kept;
    }

    private void Total()
    {
        var kept = _frame.Rows;
        var weights = _frame.Weights;
        double batchW = weights.IsEmpty ? kept : 0, batchW2 = weights.IsEmpty ? kept : 0;
        foreach (var w in weights)
        {
            batchW += w;
            batchW2 += w * w;
        }
        _sumW.Add(batchW);
        _sumW2.Add(batchW2);
        _events += kept;
    }

    // Features and batch visitors are independent from here on (each touches only its own state), so large batches
    // spread them over the cores; the results do not depend on it. The batch visitors come first: a joint block's
    // visitor is the longest job of a batch, and starting it first lets the features fill the other cores beside it.
    private void Visit(FeatureBatch visit, IReadOnlyList<Action<FeatureView>> batchVisits, FeatureBatchFloat32? visitFloat32)
    {
        var b = batchVisits.Count;
        void One(int job)
        {
            if (job < b)
            {
                batchVisits[job](_frame);
                return;
            }
            var i = job - b;
            if (TakenOnDecoding(i)) return;
            // A float32 column read straight, with unit weights, is offered as stored: no conversion to doubles.
            if (visitFloat32 is not null && _deferredColumn[i] >= 0 && _inputs.Conditions[i] is null && _weightIndex < 0
                && _batch!.Float32Column(_deferredColumn[i]) is { IsEmpty: false } stored && visitFloat32(i, stored))
                return;
            if (_inputs.Conditions[i] is not null && _inputs.Selection is null && GatherOwn(i, visitFloat32)) return;
            var values = _inputs.Conditions[i] is null ? _frame.Feature(i) : _ownValues[i].AsSpan(0, _ownRows[i]);
            var featureWeights = _inputs.Conditions[i] is null ? _frame.Weights
                : _weightIndex >= 0 ? _ownWeights[i].AsSpan(0, _ownRows[i]) : ReadOnlySpan<double>.Empty;
            visit(i, values, featureWeights);
        }
        var jobs = b + _n;
        // Jobs with work left: with one or none, waking other threads would only cost time.
        var pending = b;
        for (var i = 0; i < _n && pending < 2; i++)
            if (!TakenOnDecoding(i)) pending++;
        if (pending > 1 && _frame.Rows >= ParallelBatchRows && _pass.Parallelism > 1)
            Parallel.For(0, jobs, new ParallelOptions { MaxDegreeOfParallelism = _pass.Parallelism }, One);
        else for (var job = 0; job < jobs; job++) One(job);
    }

    // Whether the feature's values of this batch were taken as its column was decoded (DecodedFloat32Slice).
    private bool TakenOnDecoding(int feature) =>
        _deferredColumn[feature] >= 0 && _earlyFeature[_deferredColumn[feature]] == feature && _batch!.TakenOnDecoding(_deferredColumn[feature]);

    // A category's values of this batch, in row order, from the rows its condition kept: as stored floats, offered to
    // the float visitor, for a float32 column with unit weights (true when taken); else as doubles (and weights) into the
    // buffers the double visit reads, as the compaction of a selection writes them.
    private bool GatherOwn(int i, FeatureBatchFloat32? visitFloat32)
    {
        var root = _sameCondition[i] >= 0 ? _sameCondition[i] : i;
        var index = _ownIndex[root].AsSpan(0, _ownRows[i]);
        if (visitFloat32 is not null && _ownColumn[i] >= 0 && _weightIndex < 0
            && _batch!.Float32Column(_ownColumn[i]) is { IsEmpty: false } stored)
        {
            if (_ownFloats[i] is not { } floats || floats.Length < index.Length) _ownFloats[i] = floats = new float[_mask.Length];
            CategoryRows.Gather(stored, index, floats);
            if (visitFloat32(i, floats.AsSpan(0, index.Length))) return true;
        }
        var source = _frame.Feature(i); // converts a deferred column
        var values = _ownValues[i]!;
        for (var k = 0; k < index.Length; k++) values[k] = source[index[k]];
        if (_weightIndex >= 0)
        {
            var weights = _ownWeights[i]!;
            for (var k = 0; k < index.Length; k++) weights[k] = _weights[index[k]];
        }
        return false;
    }

    // The rows whose condition holds (non-zero, not NaN), in order, into index; how many. Without a branch on the
    // condition: every row is written, the count moves on only past those that hold (a category's rows are scattered,
    // so a branch would be mispredicted at about every other row).
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    private static int PassingRows(ReadOnlySpan<double> condition, int[] index)
    {
        if (index.Length < condition.Length) throw new ArgumentException("The index is shorter than the rows.", nameof(index));
        var n = 0;
        for (var r = 0; r < condition.Length; r++)
        {
            var c = condition[r];
            index[n] = r;
            var holds = (c != 0) & !double.IsNaN(c);
            n += System.Runtime.CompilerServices.Unsafe.As<bool, byte>(ref holds);
        }
        return n;
    }

    /// <summary>A condition holds when it is non-zero and not NaN.</summary>
    private static bool Passes(double condition) => condition != 0 && !double.IsNaN(condition);

    /// <summary>
    /// GATE2007 for a weight that is not finite, at its cell where the reader can say (a CSV line and column, a Parquet
    /// row) and in the file's own words (an empty cell or a null is a missing weight, not a NaN);
    /// <paramref name="eventIndex"/> -1: unknown.
    /// </summary>
    internal static GateInputException BadWeight(string file, SampleBatch batch, string weightColumn, int weightIndex, int row, long eventIndex,
        double value, string need)
    {
        if (batch.Locate?.Invoke(row, weightIndex) is { } origin)
            return new GateInputException(ErrorCodes.SampleBadWeight,
                $"weight column '{weightColumn}' holds {origin.Written} at {origin.Place} of sample file '{file}'; {need}",
                origin.Location);
        return new GateInputException(ErrorCodes.SampleBadWeight,
            $"weight column '{weightColumn}' holds {InvariantNumber.Short(value)} " +
            (eventIndex >= 0 ? $"at event {eventIndex + 1} of the sample (in file '{file}'); {need}" : $"in sample file '{file}'; {need}"),
            new SourceLocation(file));
    }
}
