namespace GateTasks.Engine.Demo;

/// <summary>The commented precision contracts the demo writes next to its samples, one per surrogate kind.</summary>
internal static class DemoContract
{
    public const string FileName = "precision-contract.yaml";
    public const string ReferenceFileName = "reference/fullsim-reference.parquet";

    /// <summary>The contract of a demo kind.</summary>
    public static string For(DemoKind kind) => kind == DemoKind.Response ? ResponseText : Text;

    /// <summary>The unconditional (generator) surrogate's contract: every kind of tolerance check the gate has, on reco-level features.</summary>
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

        # The analysis's mass window, applied to reference and sample alike before anything is filled.
        selection: "m_gg > 65 && m_gg < 180"

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
            ratio-max:              # largest |surrogate/reference − 1| of normalised bin contents
              core: 0.03
              tails: 0.10

        features:
          - name: m_gg              # the diphoton mass the analysis fits: more bins (narrow ones at the peak)
            binning: { bins: 30 }
            regions:                # the sideband fit leans on the high-mass side: tighter there than in the other tail
              high-mass: { quantiles: [0.95, 1.0] }
            checks:
              ratio-max: { tails: 0.08, high-mass: 0.06 }
              mean-shift-max: 0.01  # the peak position and width the fit relies on
              width-ratio-max: 0.01
              far-tail-max: 0.001   # events beyond the reference's 0.1% / 99.9% quantiles
          - name: pt_gg
            binning: { bins: 10 }   # coarser, so each jet category below has enough events per bin
            checks:
              ks-max: 0.015
              ratio-max: { core: 0.05, tails: 0.12 }
              far-tail-max: 0.001
            categories:             # the same checks per jet multiplicity, and each category's share
              by: min(n_jets, 2)
              values: [0, 1, 2]     # 0, 1 and ≥ 2 jets
              fraction-max: 0.01
          - name: e_lead
          - name: e_sublead
          - name: eta_lead
          - name: eta_sublead
          - name: cos_theta_star
          - name: et_ratio          # derived: E_T of the subleading photon over that of the leading one
            expression: (e_sublead / cosh(eta_sublead)) / (e_lead / cosh(eta_lead))
          - name: delta_phi         # derived: azimuthal opening angle, folded into [0, π]
            expression: abs(atan2(sin(phi_lead - phi_sublead), cos(phi_lead - phi_sublead)))
          - name: jet1_pt           # leading-jet p_T: exactly 0 when there is no jet
            spike: 0                # the share of zeros is checked on its own; the other checks see the rest
            checks:
              fraction-max: 0.01
          - name: n_jets            # jet multiplicity: one bin per value
            kind: discrete
            checks:
              fraction-max: 0.01    # every multiplicity's share
          - name: converted         # leading photon converted (0/1): a discrete fraction
            kind: discrete
            checks:
              ks-max: off           # a two-valued flag: the fractions and ratio say it all
              wasserstein-max: off
              ratio-max: 0.03       # both categories are in the core, so one tolerance for all
              fraction-max: 0.01

        # Correlations the analysis relies on: every pair among the three energies, and the mass against
        # the diphoton p_T.
        correlations:
          - features: [e_lead, e_sublead, pt_gg]
            pearson-max: 0.02
            spearman-max: 0.02
          - features: [m_gg, pt_gg]
            pearson-max: 0.02
            spearman-max: 0.02
        """;

    /// <summary>The response surrogate's contract: reco/gen in bins of the true energy.</summary>
    public const string ResponseText = """
        # Precision contract for the GateTasks demo's fast detector response: a model that takes each
        # generator-level photon and returns the reconstructed one. What it must get right is the
        # response as a function of the true energy, so the checks run on reco/gen and reco − gen in
        # bins of the generator-level energy.
        contract-version: 1
        title: demo-diphoton-response

        sample:
          path: surrogate-faithful.parquet
          weight: weight
        reference: reference/fullsim-reference.parquet

        decision:
          confidence: 0.95
          false-alarm: 0.01
          correction: holm
          inconclusive: fail

        defaults:
          binning: { bins: 30, spacing: quantile }
          core: 0.90

        features:
          - name: response_lead             # scale and resolution of the leading photon
            expression: e_lead / e_lead_true
            binning: { bins: 20 }           # each true-energy bin below holds 5–30% of the events
            checks:
              quantile-shift-max: 0.10      # scale: median and core bounds, in units of σ_response
              width-ratio-max: 0.02         # resolution: σ of the response
              iqr-width-ratio-max: 0.03     # resolution of the core alone: IQR/1.349
              ks-max: 0.02                  # the whole response distribution
              ratio-max: { core: 0.10, tails: 0.25 }
            categories:                     # per bin of the true energy
              by: min(floor(e_lead_true / 25), 5)
              values: [1, 2, 3, 4, 5]       # 25–50, 50–75, 75–100, 100–125, ≥ 125 GeV (E_T > 20 GeV leaves 0–25 empty)
          - name: residual_sublead          # reco − gen of the other photon, where an absolute offset matters
            expression: e_sublead - e_sublead_true
            checks:
              mean-shift-max: 0.02
              width-ratio-max: 0.02
          - name: m_gg                      # the response must still give the right mass distribution
            binning: { bins: 40 }
            checks:
              ks-max: 0.01
              mean-shift-max: 0.01
              width-ratio-max: 0.02
        """;
}
