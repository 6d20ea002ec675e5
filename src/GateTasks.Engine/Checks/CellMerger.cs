using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Merges neighbouring cells until each holds at least <see cref="MinimumEffectiveEntries"/> effective entries
/// ((Σw)²/Σw², Kish 1965) in both histograms, so the χ² approximation holds; the rule of at least five expected
/// entries per cell is Cochran's (1954), common practice ever since.
/// </summary>
internal static class CellMerger
{
    public const double MinimumEffectiveEntries = 5;

    /// <summary>The merged cells of both histograms and how many original cells were folded into neighbours.</summary>
    public static (CellContents A, CellContents B, int Merged) MergeSparse(CellContents a, CellContents b)
    {
        var aw = new List<double>(); var aw2 = new List<double>();
        var bw = new List<double>(); var bw2 = new List<double>();
        double accA = 0, accA2 = 0, accB = 0, accB2 = 0;
        var merged = 0;
        var open = false;
        for (var i = 0; i < a.SumW.Length; i++)
        {
            if (open) merged++;
            accA += a.SumW[i]; accA2 += a.SumW2[i];
            accB += b.SumW[i]; accB2 += b.SumW2[i];
            open = true;
            if (KishCount.Of(accA, accA2) >= MinimumEffectiveEntries && KishCount.Of(accB, accB2) >= MinimumEffectiveEntries)
            {
                aw.Add(accA); aw2.Add(accA2); bw.Add(accB); bw2.Add(accB2);
                accA = accA2 = accB = accB2 = 0;
                open = false;
            }
        }
        if (open && aw.Count > 0)
        {
            // What is left at the end is too sparse on its own: it joins the last full cell.
            aw[^1] += accA; aw2[^1] += accA2; bw[^1] += accB; bw2[^1] += accB2;
        }
        else if (open)
        {
            aw.Add(accA); aw2.Add(accA2); bw.Add(accB); bw2.Add(accB2);
        }
        return (new CellContents(aw.ToArray(), aw2.ToArray()), new CellContents(bw.ToArray(), bw2.ToArray()), merged);
    }
}
