using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Demo;

/// <summary>
/// Seeded toy "full simulation" of the demo scenario: a narrow scalar decaying to two photons plus a falling
/// diphoton continuum, boosted, then seen by a toy calorimeter with acceptance cuts. Events failing a cut are
/// regenerated, so every requested event is a selected one. The generator is MathNet's xoshiro256** (not
/// System.Random, whose algorithm is not specified), so a seed fixes the sample.
/// </summary>
/// <remarks>
/// Arithmetic is IEEE double and the stream does not depend on chunking, so a seed gives the same bytes on every
/// run; across operating systems the only residual risk is a last-bit difference in the runtime's log/exp/sin,
/// which the float32 output columns almost always absorb.
/// </remarks>
internal sealed class ToyDiphotonSimulation
{
    private readonly DemoScenarioParameters _p;
    private readonly Xoshiro256StarStar _rng;
    private readonly double _backgroundRange;
    private readonly double _lineAngleLow;
    private readonly double _lineAngleHigh;

    /// <summary>Creates a generator; the same parameters and seed always give the same events.</summary>
    public ToyDiphotonSimulation(DemoScenarioParameters parameters, int seed)
    {
        ArgumentNullException.ThrowIfNull(parameters);
        Validate(parameters);
        _p = parameters;
        _rng = new Xoshiro256StarStar(seed, threadSafe: false);
        _backgroundRange = 1 - Math.Exp(-parameters.BackgroundSlope * (parameters.MassMax - parameters.MassMin));
        var halfWidth = parameters.ResonanceWidth / 2;
        _lineAngleLow = Math.Atan((parameters.MassMin - parameters.ResonanceMass) / halfWidth);
        _lineAngleHigh = Math.Atan((parameters.MassMax - parameters.ResonanceMass) / halfWidth);
    }

    /// <summary>Candidate events generated so far, selected or not.</summary>
    public long Candidates { get; private set; }

    /// <summary>Events that passed every cut and were returned.</summary>
    public long Selected { get; private set; }

    /// <summary>Fills the first <paramref name="count"/> rows of <paramref name="chunk"/> with new selected events.</summary>
    public void Generate(DemoEventChunk chunk, int count)
    {
        ArgumentNullException.ThrowIfNull(chunk);
        ArgumentOutOfRangeException.ThrowIfNegative(count);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(count, chunk.Capacity);
        for (var i = 0; i < count; i++)
        {
            while (!TryGenerate(chunk, i))
            {
            }
        }
        chunk.Count = count;
        Selected += count;
    }

    private bool TryGenerate(DemoEventChunk chunk, int row)
    {
        Candidates++;
        var p = _p;
        var rng = _rng;
        var isSignal = rng.NextDouble() < p.SignalFraction;

        // True diphoton mass: Breit–Wigner (Cauchy) line by inversion within the range, or the exponential continuum.
        double mass;
        if (isSignal)
        {
            var angle = _lineAngleLow + (_lineAngleHigh - _lineAngleLow) * rng.NextDouble();
            mass = p.ResonanceMass + p.ResonanceWidth / 2 * Math.Tan(angle);
        }
        else
        {
            mass = p.MassMin - Math.Log(1 - _backgroundRange * rng.NextDouble()) / p.BackgroundSlope;
        }

        // Production: p_T ~ Gamma(2, θ), Gaussian rapidity, uniform azimuth.
        var pt = Gamma.Sample(rng, 2.0, 1.0 / (isSignal ? p.SignalPtScale : p.BackgroundPtScale));
        var rapidity = Normal.Sample(rng, 0.0, p.RapiditySpread);
        var phi = 2 * Math.PI * rng.NextDouble();
        var mt = Math.Sqrt(mass * mass + pt * pt);
        var sysE = mt * Math.Cosh(rapidity);
        var sysPx = pt * Math.Cos(phi);
        var sysPy = pt * Math.Sin(phi);
        var sysPz = mt * Math.Sinh(rapidity);

        // Decay in the rest frame (axis along the beam): isotropic for the scalar, 1 + k·cos²θ* for the continuum.
        double cosTheta;
        if (isSignal)
        {
            cosTheta = 2 * rng.NextDouble() - 1;
        }
        else
        {
            var k = p.BackgroundCosThetaStarTerm;
            do
            {
                cosTheta = 2 * rng.NextDouble() - 1;
            }
            while (rng.NextDouble() * (1 + Math.Max(k, 0)) > 1 + k * cosTheta * cosTheta);
        }
        var sinTheta = Math.Sqrt(Math.Max(0, 1 - cosTheta * cosTheta));
        var decayPhi = 2 * Math.PI * rng.NextDouble();
        var half = mass / 2;
        var kx = half * sinTheta * Math.Cos(decayPhi);
        var ky = half * sinTheta * Math.Sin(decayPhi);
        var kz = half * cosTheta;

        // Lorentz boost of photon 1 to the lab; (γ−1)/β² is written γ²/(γ+1) so a system at rest needs no special case.
        var gamma = sysE / mass;
        var bx = sysPx / sysE;
        var by = sysPy / sysE;
        var bz = sysPz / sysE;
        var bk = bx * kx + by * ky + bz * kz;
        var factor = gamma * gamma / (gamma + 1) * bk + gamma * half;
        var e1 = gamma * (half + bk);
        var px1 = kx + factor * bx;
        var py1 = ky + factor * by;
        var pz1 = kz + factor * bz;
        // Photon 2 by momentum conservation.
        var e2 = sysE - e1;
        var px2 = sysPx - px1;
        var py2 = sysPy - py1;
        var pz2 = sysPz - pz1;

        if (!TryReconstruct(e1, px1, py1, pz1, out var recoE1, out var eta1, out var phi1, out var conv1) ||
            !TryReconstruct(e2, px2, py2, pz2, out var recoE2, out var eta2, out var phi2, out var conv2))
        {
            return false;
        }

        var et1 = recoE1 / Math.Cosh(eta1);
        var et2 = recoE2 / Math.Cosh(eta2);
        if (et1 < et2)
        {
            (recoE1, recoE2) = (recoE2, recoE1);
            (eta1, eta2) = (eta2, eta1);
            (phi1, phi2) = (phi2, phi1);
            (conv1, conv2) = (conv2, conv1);
            (et1, et2) = (et2, et1);
            (e1, e2) = (e2, e1);
        }

        // Reconstructed (massless) photons.
        var rx1 = et1 * Math.Cos(phi1);
        var ry1 = et1 * Math.Sin(phi1);
        var rz1 = et1 * Math.Sinh(eta1);
        var rx2 = et2 * Math.Cos(phi2);
        var ry2 = et2 * Math.Sin(phi2);
        var rz2 = et2 * Math.Sinh(eta2);
        var m2 = 2 * et1 * et2 * (Math.Cosh(eta1 - eta2) - Math.Cos(phi1 - phi2));
        var recoMass = Math.Sqrt(Math.Max(m2, 0));
        var qx = rx1 + rx2;
        var qy = ry1 + ry2;
        var qt2 = qx * qx + qy * qy;
        var recoPt = Math.Sqrt(qt2);

        if (p.TailThinningFraction > 0 && recoMass > p.TailThinningMassThreshold &&
            rng.NextDouble() < p.TailThinningFraction)
        {
            return false;
        }

        // Collins & Soper (1977), Phys. Rev. D 16, 2219: cos θ* = 2(p1⁺p2⁻ − p1⁻p2⁺)/(m·√(m² + Q_T²)),
        // p± = (E ± p_z)/√2, which reduces to 2(p_z1·E2 − E1·p_z2)/(m·√(m² + Q_T²)).
        var cosThetaStar = recoMass > 0
            ? Math.Min(1.0, Math.Abs(2 * (rz1 * recoE2 - recoE1 * rz2) / (recoMass * Math.Sqrt(m2 + qt2))))
            : 0.0;

        var jetMean = p.JetMultiplicityBase + p.JetMultiplicityPerGeV * recoPt;
        var jets = Math.Min(Poisson.Sample(rng, jetMean), p.MaxJets);
        // The leading jet recoils against the diphoton system: its p_T above the threshold grows with p_T(γγ).
        var jetPt = jets > 0 ? p.JetPtThreshold - Math.Log(1 - rng.NextDouble()) * (p.JetPtSlope + 0.5 * recoPt) : 0.0;
        var weight = Gamma.Sample(rng, p.WeightShape, p.WeightShape);

        chunk.MassGg[row] = (float)recoMass;
        chunk.PtGg[row] = (float)recoPt;
        chunk.EnergyLead[row] = (float)recoE1;
        chunk.EnergySublead[row] = (float)recoE2;
        chunk.EtaLead[row] = (float)eta1;
        chunk.EtaSublead[row] = (float)eta2;
        chunk.PhiLead[row] = (float)phi1;
        chunk.PhiSublead[row] = (float)phi2;
        chunk.CosThetaStar[row] = (float)cosThetaStar;
        chunk.JetCount[row] = jets;
        chunk.LeadJetPt[row] = (float)jetPt;
        chunk.LeadConverted[row] = conv1 ? 1 : 0;
        chunk.EnergyLeadTrue[row] = (float)e1;
        chunk.EnergySubleadTrue[row] = (float)e2;
        chunk.Weight[row] = (float)weight;
        return true;
    }

    /// <summary>
    /// Conversion, calorimeter energy response and angular smearing of one true photon, then the acceptance:
    /// |η| below the edge and E_T above the threshold.
    /// </summary>
    private bool TryReconstruct(double e, double px, double py, double pz,
        out double recoE, out double eta, out double phi, out bool converted)
    {
        var p = _p;
        var rng = _rng;
        var trueEta = Math.Asinh(pz / Math.Sqrt(px * px + py * py));
        var truePhi = Math.Atan2(py, px);
        var edge = Math.Min(Math.Abs(trueEta) / p.EtaAcceptance, 1.0);
        var conversionProbability = p.ConversionProbabilityCentral +
            (p.ConversionProbabilityEdge - p.ConversionProbabilityCentral) * edge * edge;
        converted = rng.NextDouble() < conversionProbability;
        var resolution = p.RelativeEnergyResolution(e, converted);
        recoE = e * (1 + resolution * Normal.Sample(rng, 0.0, 1.0));
        eta = trueEta + p.EtaSmearing * Normal.Sample(rng, 0.0, 1.0);
        phi = truePhi + p.PhiSmearing * Normal.Sample(rng, 0.0, 1.0);
        // Wrapped into (−π, π], so the column has one convention.
        if (phi > Math.PI) phi -= 2 * Math.PI;
        else if (phi <= -Math.PI) phi += 2 * Math.PI;
        return recoE > 0 && Math.Abs(eta) < p.EtaAcceptance && recoE / Math.Cosh(eta) > p.MinTransverseEnergy;
    }

    private static void Validate(DemoScenarioParameters p)
    {
        static void Require(bool ok, string what)
        {
            if (!ok)
            {
                throw new ArgumentOutOfRangeException(nameof(p), $"Demo scenario parameter out of range: {what}.");
            }
        }

        Require(p.MassMin > 0 && p.MassMax > p.MassMin, "need 0 < MassMin < MassMax");
        Require(p.ResonanceWidth > 0, "ResonanceWidth must be positive");
        Require(p.SignalFraction is >= 0 and <= 1, "SignalFraction must be within [0, 1]");
        Require(p.BackgroundSlope > 0, "BackgroundSlope must be positive");
        Require(p.BackgroundCosThetaStarTerm > -1, "BackgroundCosThetaStarTerm must exceed -1");
        Require(p.SignalPtScale > 0 && p.BackgroundPtScale > 0, "p_T scales must be positive");
        Require(p.RapiditySpread > 0, "RapiditySpread must be positive");
        Require(p.StochasticTerm >= 0 && p.NoiseTerm >= 0 && p.ConstantTerm >= 0, "resolution terms must not be negative");
        Require(p.ConvertedStochasticScale > 0, "ConvertedStochasticScale must be positive");
        Require(p.ConversionProbabilityCentral is >= 0 and <= 1 && p.ConversionProbabilityEdge is >= 0 and <= 1,
            "conversion probabilities must be within [0, 1]");
        Require(p.EtaSmearing >= 0 && p.PhiSmearing >= 0, "angular smearing must not be negative");
        Require(p.EtaAcceptance > 0, "EtaAcceptance must be positive");
        Require(p.MinTransverseEnergy >= 0, "MinTransverseEnergy must not be negative");
        Require(p.JetMultiplicityBase > 0 && p.JetMultiplicityPerGeV >= 0, "jet multiplicity mean must be positive");
        Require(p.MaxJets >= 0, "MaxJets must not be negative");
        Require(p.JetPtThreshold > 0 && p.JetPtSlope > 0, "jet p_T threshold and slope must be positive");
        Require(p.DegradedResolutionFactor > 0 && p.DegradedEnergyMax >= p.DegradedEnergyMin, "resolution degradation out of range");
        Require(p.WeightShape > 0, "WeightShape must be positive");
        Require(p.TailThinningFraction is >= 0 and < 1, "TailThinningFraction must be within [0, 1)");
    }
}
