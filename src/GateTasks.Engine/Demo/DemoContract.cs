namespace GateTasks.Engine.Demo;

/// <summary>The commented precision contract the demo writes next to its samples.</summary>
internal static class DemoContract
{
    public const string FileName = "precision-contract.yaml";
    public const string ReferenceFileName = "reference/fullsim-reference.parquet";

    public const string Text = """
        # Precision contract for the GateTasks demo: a surrogate of the toy full simulation of
        # Φ(95) → γγ over the diphoton continuum. Every tolerance below is what this demo analysis
        # requires of the surrogate; tighten or loosen them only with a reason.
        contract-version: 1
        title: demo-diphoton

        # The surrogate sample to judge (a file, a folder or a glob; relative to this file).
        # CI can point elsewhere with 'gatetasks check --sample PATH'.
        sample:
          path: surrogate-faithful.parquet
          weight: weight

        # Reference histograms built from the trusted full simulation with
        #   gatetasks reference build --from fullsim.parquet
        reference: reference/fullsim-reference.parquet

        # How verdicts are reached: a check passes when the upper end of its 95% confidence interval is
        # below the tolerance, and fails when its p-value, Holm-corrected over all checks, is at most 1%
        # (so a faithful surrogate fails a build at most 1% of the time). Otherwise it is inconclusive,
        # and says how many surrogate events would decide it.
        decision:
          confidence: 0.95
          false-alarm: 0.01
          correction: holm
          inconclusive: fail

        defaults:
          binning: { bins: 20, spacing: quantile }   # equal-probability bins from the reference
          core: 0.90                                 # core = central 90% of the reference
          checks:
            ks-max: 0.01            # largest gap between the cumulative distributions
            wasserstein-max: 0.02   # W1 distance in units of the reference's standard deviation
            chi2-test: on           # χ² homogeneity test, in the same 1% family
            ratio-max:              # largest |surrogate/reference − 1| of normalised bin contents
              core: 0.03
              tails: 0.10

        features:
          - name: m_gg              # the diphoton mass the analysis fits: more bins (narrow ones at the peak)
            binning: { bins: 30 }
            checks:
              ratio-max: { tails: 0.08 }
              mean-shift-max: 0.01  # the peak position and width the fit relies on
              width-ratio-max: 0.01
          - name: pt_gg
          - name: e_lead
          - name: e_sublead
          - name: eta_lead
          - name: eta_sublead
          - name: cos_theta_star
          - name: n_jets            # jet multiplicity: one bin per value
            kind: discrete
          - name: converted         # leading photon converted (0/1): a discrete fraction
            kind: discrete
            checks:
              ks-max: off           # a two-valued flag: the ratio and χ² say it all
              wasserstein-max: off
              ratio-max: 0.03       # both categories are in the core, so one tolerance for all
        """;
}
