using System.Xml.Linq;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Reports;

namespace GateTasks.Engine.Tests.Reports;

/// <summary>
/// The pair map's numbers: the pull per cell on a hand-computed 2×2 case, the coarse map grid and how cells on the
/// features' axes add up into it, and the SVG's three panels.
/// </summary>
public sealed class PairMapTests
{
    private static readonly CorrelationSpec Pair = new("a", "b", null, null, new SourceLocation("contract.yaml", 3, 5));

    /// <summary>Cells of a 2×2 grid with empty flows, as the storage lays them out: (i, j) at (i + 1)·4 + (j + 1).</summary>
    private static double[] Grid2x2(double c00, double c01, double c10, double c11)
    {
        var cells = new double[16];
        (cells[5], cells[6], cells[9], cells[10]) = (c00, c01, c10, c11);
        return cells;
    }

    [Fact]
    public void The_pull_of_a_hand_computed_2x2_case()
    {
        var axis = Axis.FromEdges([0, 1, 2]);
        // Reference: unit weights, Σw = Σw² = 10, 20, 30, 40 (R = 100). Surrogate: weight 2 per event, Σw = 8, 12, 10, 20
        // (S = 50), Σw² = 2·Σw = 16, 24, 20, 40.
        var reference = new CellSums(Grid2x2(10, 20, 30, 40), Grid2x2(10, 20, 30, 40));
        var surrogate = new CellSums(Grid2x2(8, 12, 10, 20), Grid2x2(16, 24, 20, 40));
        var map = PairMap.From(Pair, axis, axis, false, false, reference, surrogate)!;
        // Pull = (s/S − r/R) / √(Σw²ₛ/S² + Σw²ᵣ/R²) (Demortier & Lyons 2002; Σw² the variance of a weighted cell), by hand:
        // (0,0): (0.16 − 0.10) / √(16/2500 + 10/10000) = 0.06 / √0.0074 = 0.697486
        // (0,1): (0.24 − 0.20) / √(24/2500 + 20/10000) = 0.04 / √0.0116 = 0.371391
        // (1,0): (0.20 − 0.30) / √(20/2500 + 30/10000) = −0.1 / √0.011 = −0.953463
        // (1,1): (0.40 − 0.40) / … = 0
        Assert.Equal(0.697486, map.Pull[0, 0], 6);
        Assert.Equal(0.371391, map.Pull[0, 1], 6);
        Assert.Equal(-0.953463, map.Pull[1, 0], 6);
        Assert.Equal(0, map.Pull[1, 1], 12);
        // Unit cells: each density is the side's share, 10/100 and 8/50; nothing lies in the flows.
        Assert.Equal(0.10, map.Reference[0, 0], 12);
        Assert.Equal(0.16, map.Surrogate[0, 0], 12);
        Assert.Equal(0, map.ReferenceOutside, 12);
        Assert.Equal(0, map.SurrogateOutside, 12);
    }

    [Fact]
    public void A_cell_empty_on_both_sides_has_no_pull_and_the_flows_share_is_said()
    {
        var axis = Axis.FromEdges([0, 1, 2]);
        var withFlow = Grid2x2(10, 0, 30, 40);
        withFlow[0] = 20; // the underflow of both axes holds 20 of 100
        var map = PairMap.From(Pair, axis, axis, false, false, new CellSums(withFlow, withFlow), new CellSums(Grid2x2(10, 0, 30, 40), Grid2x2(10, 0, 30, 40)))!;
        Assert.True(double.IsNaN(map.Pull[0, 1]));
        // By hand: 20 of the reference's 100 lie outside the cells, none of the surrogate's 80.
        Assert.Equal(0.2, map.ReferenceOutside, 12);
        Assert.Equal(0, map.SurrogateOutside, 12);
    }

    [Fact]
    public void The_map_grid_keeps_every_kth_edge_and_cells_on_the_features_axes_add_up_into_it()
    {
        // 24 bins of width 1: k = ⌈24/12⌉ = 2, so 12 bins of width 2. 25 bins: k = 3, edges 0, 3, …, 24 and the last, 25.
        var fine = Axis.FromEdges(Enumerable.Range(0, 25).Select(i => (double)i).ToList());
        Assert.Equal(Enumerable.Range(0, 13).Select(i => 2.0 * i), PairGrid.MapAxis(fine).Edges.ToArray());
        var odd = Axis.FromEdges(Enumerable.Range(0, 26).Select(i => (double)i).ToList());
        Assert.Equal(Enumerable.Range(0, 9).Select(i => 3.0 * i).Append(25), PairGrid.MapAxis(odd).Edges.ToArray());
        var few = Axis.FromEdges([0, 1, 2, 3]);
        Assert.Same(few, PairGrid.MapAxis(few));

        // One unit of weight in every fine cell (26 × 5 with flows): a map cell holds as many as the fine cells it covers.
        var cells = Enumerable.Repeat(1.0, 26 * 5).ToArray();
        var coarse = PairGrid.Coarsen(cells, fine, few)!;
        Assert.Equal(14 * 5, coarse.Length);
        Assert.Equal(cells.Sum(), coarse.Sum());
        Assert.Equal(1, coarse[0]);            // underflow × underflow stays one cell
        Assert.Equal(2, coarse[1 * 5 + 1]);    // map bin 0 of the first axis covers fine bins 0 and 1
        Assert.Equal(1, coarse[13 * 5 + 4]);   // overflow × overflow
        Assert.Null(PairGrid.Coarsen(cells[1..], fine, few));
    }

    [Fact]
    public void Cells_filled_on_the_features_axes_and_merged_equal_cells_filled_on_the_map_grid()
    {
        // The program against itself: the same events filled on 30 uneven bins per axis (flows and values on edges
        // included) and merged, and filled directly on the map grid, give the same counts cell by cell.
        var edges = Enumerable.Range(0, 31).Select(i => i * i / 30.0).ToList();
        var axis = Axis.FromEdges(edges);
        var random = new Random(7);
        var x = Enumerable.Range(0, 20_000).Select(i => i % 97 == 0 ? edges[i % 31] : random.NextDouble() * 34 - 2).ToArray();
        var y = Enumerable.Range(0, 20_000).Select(_ => random.NextDouble() * 34 - 2).ToArray();
        var fine = new Histogram2D(axis, axis);
        var map = PairGrid.For(Pair, axis, axis);
        fine.Fill(x, y, ReadOnlySpan<double>.Empty);
        map.Fill(x, y, ReadOnlySpan<double>.Empty);
        var fineCells = new ExactCells(fine.CellCount);
        var mapCells = new ExactCells(map.CellCount);
        fine.MoveCellsInto(fineCells);
        map.MoveCellsInto(mapCells);
        Assert.Equal(mapCells.SumW(), PairGrid.Coarsen(fineCells.SumW(), axis, axis));
        Assert.Equal(20_000, mapCells.SumW().Sum());
    }

    [Fact]
    public void A_pair_without_a_chi2_test_gathers_at_most_the_map_grids_196_cells()
    {
        var fine = Axis.FromEdges(Enumerable.Range(0, 101).Select(i => (double)i).ToList());
        Assert.Equal(14 * 14, PairGrid.For(Pair, fine, fine).CellCount);
        var tested = Pair with { Chi2 = new GoodnessOfFitTest(CheckKind.ChiSquare2DTest, new SourceLocation("contract.yaml", 4, 5)) };
        Assert.Equal(102 * 102, PairGrid.For(tested, fine, fine).CellCount);
    }

    [Fact]
    public void The_map_is_one_svg_of_three_panels_that_parses_as_xml()
    {
        var axis = Axis.FromEdges([0, 1, 2]);
        var map = PairMap.From(Pair, axis, axis, false, false, new CellSums(Grid2x2(10, 20, 30, 40), Grid2x2(10, 20, 30, 40)),
            new CellSums(Grid2x2(8, 12, 10, 20), Grid2x2(16, 24, 20, 40)))!;
        // System.Xml.Linq parses the standalone document.
        var svg = XDocument.Parse(PairMapPlot.Document(map));
        var panels = svg.Root!.Elements().Where(e => e.Name.LocalName == "svg").Select(e => (string?)e.Attribute("data-panel")).ToList();
        Assert.Equal(["reference", "surrogate", "pull"], panels);
        // Clip paths are named per panel, so no id repeats inside the map.
        var ids = svg.Descendants().Select(e => (string?)e.Attribute("id")).OfType<string>().ToList();
        Assert.Equal(ids.Count, ids.Distinct().Count());
    }
}
